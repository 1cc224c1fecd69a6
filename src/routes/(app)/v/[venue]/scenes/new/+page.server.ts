import { fail, redirect } from '@sveltejs/kit';
import { EDITORS, requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { keep, parseForm } from '$lib/server/forms';
import { NameTaken, createScene, refErrors, sceneContext } from '$lib/server/scenes/records';
import { sceneFormSchema } from '$lib/schemas/scene';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event, ...EDITORS);
	const context = await sceneContext(db, venue.id);
	return { rooms: context.rooms, sensors: context.sensors };
};

export const actions: Actions = {
	default: async (event) => {
		const venue = requireRole(event, ...EDITORS);
		const parsed = await parseForm(event.request, sceneFormSchema);
		if (!parsed.ok) return fail(400, { values: keep(parsed.raw), errors: parsed.errors });
		const errors = refErrors(await sceneContext(db, venue.id), parsed.data);
		if (Object.keys(errors).length) return fail(400, { values: keep(parsed.raw), errors });
		try {
			const row = await createScene(db, venue.id, event.locals.person!.id, parsed.data);
			redirect(303, `/v/${venue.slug}/scenes/${row.id}`);
		} catch (e) {
			if (!(e instanceof NameTaken)) throw e;
			return fail(400, {
				values: keep(parsed.raw),
				errors: { name: ['A scene of this venue already has that name.'] }
			});
		}
	}
};
