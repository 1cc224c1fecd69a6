import { fail } from '@sveltejs/kit';
import { and, eq } from 'drizzle-orm';
import { EDITORS, requireRole } from '$lib/server/auth/guard';
import { audit } from '$lib/server/audit';
import { db } from '$lib/server/db';
import { controllers } from '$lib/server/db/schema';
import { keep, parseForm } from '$lib/server/forms';
import { venueControllers } from '$lib/server/props/queries';
import { controllerSchema } from '$lib/schemas/controller';
import { pwmFrequencyForBits } from '$lib/electronics';
import { z } from 'zod';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event);
	const list = await venueControllers(db, venue.id);
	return {
		controllers: list.map((c) => {
			const f = pwmFrequencyForBits({
				clockHz: c.clockHz,
				prescaler: c.prescaler,
				bits: c.pwmBits
			});
			return { ...c, pwmHz: f.ok ? f.value : null };
		}),
		canEdit: EDITORS.includes(venue.role)
	};
};

export const actions: Actions = {
	add: async (event) => {
		const venue = requireRole(event, ...EDITORS);
		const parsed = await parseForm(event.request, controllerSchema);
		if (!parsed.ok) return fail(400, { values: keep(parsed.raw), errors: parsed.errors });
		await db.insert(controllers).values({ ...parsed.data, venueId: venue.id });
		await audit(db, {
			venueId: venue.id,
			personId: event.locals.person!.id,
			action: 'controller.added',
			detail: { name: parsed.data.name }
		});
		return { saved: true };
	},
	remove: async (event) => {
		const venue = requireRole(event, ...EDITORS);
		const parsed = await parseForm(event.request, z.object({ id: z.uuid() }));
		if (!parsed.ok) return fail(400, { message: 'That controller does not exist.' });
		const done = await db
			.delete(controllers)
			.where(and(eq(controllers.id, parsed.data.id), eq(controllers.venueId, venue.id)))
			.returning();
		if (!done.length) return fail(404, { message: 'That controller no longer exists.' });
		return { removed: true };
	}
};
