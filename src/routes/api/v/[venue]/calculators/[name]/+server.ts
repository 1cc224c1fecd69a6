import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { requireRole } from '$lib/server/auth/guard';
import { readJson } from '$lib/server/props/api';
import { plateOnController } from '$lib/electronics';
import { controllerSchema } from '$lib/schemas/controller';
import { capacitiveSettings } from '$lib/schemas/sensor';
import { curveSchema, ledStringSettings, relaySettings } from '$lib/schemas/output';
import { ledMaths, relayMaths } from '$lib/props/output-maths';
import { levelTableFor } from '$lib/props/level-table';
import type { RequestHandler } from './$types';

const pwm = z.object({
	clockHz: z.number().positive(),
	prescaler: z.number().int().min(1),
	pwmBits: z.number().int().min(8).max(16)
});

/** The shared maths over JSON, checked by the same schemas as the forms. */
export const POST: RequestHandler = async (event) => {
	requireRole(event);
	switch (event.params.name) {
		case 'capacitive': {
			const body = await readJson(
				event.request,
				z.object({ settings: capacitiveSettings, controller: controllerSchema })
			);
			if (!body.ok) return body.response;
			const { settings: s, controller: c } = body.data;
			return json(plateOnController(s, c));
		}
		case 'led-string': {
			const body = await readJson(event.request, z.object({ settings: ledStringSettings }));
			if (!body.ok) return body.response;
			return json(ledMaths(body.data.settings));
		}
		case 'relay': {
			const body = await readJson(
				event.request,
				z.object({ settings: relaySettings, pinLimitMa: z.number().positive().nullable() })
			);
			if (!body.ok) return body.response;
			return json(relayMaths(body.data.settings, body.data.pinLimitMa));
		}
		case 'level-table': {
			const body = await readJson(
				event.request,
				z.object({ curve: curveSchema, controller: pwm.nullable() })
			);
			if (!body.ok) return body.response;
			return json(levelTableFor(body.data.curve, body.data.controller));
		}
		default:
			return json(
				{ message: 'Calculators: capacitive, led-string, relay, level-table.' },
				{ status: 404 }
			);
	}
};
