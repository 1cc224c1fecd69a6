import { fail } from '@sveltejs/kit';
import { and, eq } from 'drizzle-orm';
import { EDITORS, requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { outputs } from '$lib/server/db/schema';
import { errorsByPath, parseNestedForm, readForm } from '$lib/server/props/form';
import { findOutput } from '$lib/server/props/outputs';
import { flatValues, outputValues, touchProp } from '$lib/server/props/records';
import { hazardsOf } from '$lib/props/output-maths';
import { curveSchema, outputSchema } from '$lib/schemas/output';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event);
	const found = await findOutput(db, venue.id, event.params.prop, event.params.output);
	return {
		...found,
		formValues: flatValues(
			{
				name: found.output.name,
				safeState: found.output.safeState,
				settings: found.output.settings
			},
			['settings']
		),
		hazards: hazardsOf(found.output),
		canEdit: EDITORS.includes(venue.role)
	};
};

/** Points come from the form as lines of "level, duty". */
function parsePoints(text: string) {
	return text
		.split(/\r?\n/)
		.map((l) => l.trim())
		.filter(Boolean)
		.map((l) => {
			const [x, y] = l.split(/[,;\s]+/);
			return { x, y };
		});
}

export const actions: Actions = {
	save: async (event) => {
		const venue = requireRole(event, ...EDITORS);
		const { prop, output } = await findOutput(db, venue.id, event.params.prop, event.params.output);
		const parsed = await parseNestedForm(event.request, outputSchema);
		if (!parsed.ok) return fail(400, { action: 'save', values: parsed.raw, errors: parsed.errors });
		const values = outputValues(parsed.data);
		await db
			.update(outputs)
			.set({
				...values,
				curve: values.kind === 'led_string' ? (output.curve ?? { kind: 'cie' }) : null
			})
			.where(and(eq(outputs.id, output.id), eq(outputs.venueId, venue.id)));
		await touchProp(db, venue.id, prop.id);
		return { action: 'save', saved: true };
	},
	curve: async (event) => {
		const venue = requireRole(event, ...EDITORS);
		const { prop, output } = await findOutput(db, venue.id, event.params.prop, event.params.output);
		const raw = await readForm(event.request);
		const candidate =
			raw.kind === 'points'
				? { kind: 'points', points: parsePoints(raw.points ?? '') }
				: raw.kind === 'gamma'
					? { kind: 'gamma', exponent: raw.exponent }
					: { kind: raw.kind };
		const parsed = curveSchema.safeParse(candidate);
		if (!parsed.success)
			return fail(400, {
				action: 'curve',
				values: raw,
				errors: errorsByPath(parsed.error) as Record<string, string[]>
			});
		if (output.kind !== 'led_string')
			return fail(400, {
				action: 'curve',
				values: raw,
				errors: { kind: ['Only LED strings have a brightness curve.'] } as Record<string, string[]>
			});
		await db
			.update(outputs)
			.set({ curve: parsed.data })
			.where(and(eq(outputs.id, output.id), eq(outputs.venueId, venue.id)));
		await touchProp(db, venue.id, prop.id);
		return { action: 'curve', saved: true };
	}
};
