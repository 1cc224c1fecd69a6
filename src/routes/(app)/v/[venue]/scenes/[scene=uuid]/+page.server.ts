import { error, fail, redirect } from '@sveltejs/kit';
import { EDITORS, requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { keep, parseForm } from '$lib/server/forms';
import { unstorableErrors } from '$lib/server/text';
import { errorsByPath } from '$lib/server/props/form';
import { loadScene } from '$lib/server/scenes/model';
import {
	NameTaken,
	deleteScene,
	refErrors,
	saveScene,
	sceneContext,
	sceneHistory,
	sceneJson
} from '$lib/server/scenes/records';
import { sceneContentSchema, sceneFormSchema } from '$lib/schemas/scene';
import { duplicateAction } from '../scene-actions.server';
import type { Actions, PageServerLoad, RequestEvent } from './$types';

const isUuid = (s: string) => /^[0-9a-f-]{36}$/i.test(s);

async function sceneOf(event: RequestEvent | Parameters<PageServerLoad>[0], venueId: string) {
	const loaded = isUuid(event.params.scene)
		? await loadScene(db, venueId, event.params.scene)
		: null;
	if (!loaded) error(404, 'There is no such scene in this venue.');
	return loaded;
}

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event);
	const loaded = await sceneOf(event, venue.id);
	const [context, history] = await Promise.all([
		sceneContext(db, venue.id),
		sceneHistory(db, venue.id, loaded.row.id)
	]);
	return {
		scene: sceneJson(loaded),
		...context,
		history,
		canEdit: EDITORS.includes(venue.role)
	};
};

export const actions: Actions = {
	save: async (event) => {
		const venue = requireRole(event, ...EDITORS);
		const loaded = await sceneOf(event, venue.id);
		const parsed = await parseForm(event.request, sceneFormSchema);
		const values = keep(parsed.raw, 'content');
		let content;
		if (typeof parsed.raw.content === 'string') {
			let json: unknown;
			try {
				json = JSON.parse(parsed.raw.content);
			} catch {
				json = undefined;
			}
			const unstorable = unstorableErrors(json);
			if (unstorable) return fail(400, { values, errors: {}, contentErrors: unstorable });
			const result = sceneContentSchema.safeParse(json);
			if (!result.success)
				return fail(400, {
					values,
					errors: parsed.ok ? {} : parsed.errors,
					contentErrors: errorsByPath(result.error)
				});
			content = result.data;
		}
		if (!parsed.ok) return fail(400, { values, errors: parsed.errors });
		const context = await sceneContext(db, venue.id);
		const errors = refErrors(context, parsed.data, content);
		if (Object.keys(errors).length) return fail(400, { values, errors, contentErrors: errors });
		const names = new Map(context.outputs.map((o) => [o.id, o.name]));
		try {
			const result = await saveScene(
				db,
				venue.id,
				event.locals.person!.id,
				loaded,
				parsed.data,
				content,
				(id) => names.get(id) ?? 'a removed output'
			);
			return { saved: true, changed: result.changed };
		} catch (e) {
			if (!(e instanceof NameTaken)) throw e;
			return fail(400, {
				values,
				errors: { name: ['A scene of this venue already has that name.'] }
			});
		}
	},
	duplicate: (event) => {
		requireRole(event, ...EDITORS);
		return duplicateAction(event);
	},
	remove: async (event) => {
		const venue = requireRole(event, ...EDITORS);
		const loaded = await sceneOf(event, venue.id);
		if (!(await deleteScene(db, venue.id, event.locals.person!.id, loaded.row)))
			return fail(404, { message: 'That scene was already removed.' });
		redirect(303, `/v/${venue.slug}/scenes`);
	}
};
