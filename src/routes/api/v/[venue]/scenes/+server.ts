import { json } from '@sveltejs/kit';
import { EDITORS, requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { readJson } from '$lib/server/props/api';
import { nameTakenResponse, refErrorResponse } from '$lib/server/scenes/api';
import { loadScene } from '$lib/server/scenes/model';
import {
	NameTaken,
	createScene,
	listScenes,
	refErrors,
	sceneContext,
	sceneJson
} from '$lib/server/scenes/records';
import { sceneBodySchema } from '$lib/schemas/scene';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	const venue = requireRole(event);
	const { scenes } = await listScenes(db, venue.id);
	return json({ scenes });
};

export const POST: RequestHandler = async (event) => {
	const venue = requireRole(event, ...EDITORS);
	const body = await readJson(event.request, sceneBodySchema);
	if (!body.ok) return body.response;
	const { cues = [], responses = [], ...details } = body.data;
	const errors = refErrors(await sceneContext(db, venue.id), details, { cues, responses });
	if (Object.keys(errors).length) return refErrorResponse(errors);
	try {
		const row = await createScene(db, venue.id, event.locals.person!.id, details, {
			cues,
			responses
		});
		const loaded = await loadScene(db, venue.id, row.id);
		return json({ scene: sceneJson(loaded!) }, { status: 201 });
	} catch (e) {
		if (e instanceof NameTaken) return nameTakenResponse();
		throw e;
	}
};
