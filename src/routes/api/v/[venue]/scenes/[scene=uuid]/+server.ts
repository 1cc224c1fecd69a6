import { json } from '@sveltejs/kit';
import { EDITORS, requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { readJson } from '$lib/server/props/api';
import { apiScene, nameTakenResponse, refErrorResponse } from '$lib/server/scenes/api';
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
import { sceneBodySchema } from '$lib/schemas/scene';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	const venue = requireRole(event);
	const found = await apiScene(event, venue.id);
	if (!found.ok) return found.response;
	const history = await sceneHistory(db, venue.id, found.loaded.row.id);
	return json({ scene: sceneJson(found.loaded), history });
};

/** Replaces the scene's details; cues and responses are replaced too when the body has them. */
export const PUT: RequestHandler = async (event) => {
	const venue = requireRole(event, ...EDITORS);
	const found = await apiScene(event, venue.id);
	if (!found.ok) return found.response;
	const body = await readJson(event.request, sceneBodySchema);
	if (!body.ok) return body.response;
	const { cues, responses, ...details } = body.data;
	const content =
		cues || responses
			? {
					cues: cues ?? found.loaded.cues,
					responses: responses ?? found.loaded.responses
				}
			: undefined;
	const context = await sceneContext(db, venue.id);
	const errors = refErrors(context, details, content);
	if (Object.keys(errors).length) return refErrorResponse(errors);
	const names = new Map(context.outputs.map((o) => [o.id, o.name]));
	try {
		const result = await saveScene(
			db,
			venue.id,
			event.locals.person!.id,
			found.loaded,
			details,
			content,
			(id) => names.get(id) ?? 'a removed output'
		);
		const loaded = await loadScene(db, venue.id, found.loaded.row.id);
		return json({ scene: sceneJson(loaded!), changed: result.changed });
	} catch (e) {
		if (e instanceof NameTaken) return nameTakenResponse();
		throw e;
	}
};

export const DELETE: RequestHandler = async (event) => {
	const venue = requireRole(event, ...EDITORS);
	const found = await apiScene(event, venue.id);
	if (!found.ok) return found.response;
	if (!(await deleteScene(db, venue.id, event.locals.person!.id, found.loaded.row)))
		return json({ message: 'That scene was already removed.' }, { status: 404 });
	return new Response(null, { status: 204 });
};
