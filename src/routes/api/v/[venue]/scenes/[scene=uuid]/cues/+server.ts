import { json } from '@sveltejs/kit';
import { EDITORS, requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { readJson } from '$lib/server/props/api';
import { apiScene, refErrorResponse } from '$lib/server/scenes/api';
import { loadScene } from '$lib/server/scenes/model';
import {
	refErrors,
	saveScene,
	sceneContext,
	sceneDetailsOf,
	sceneJson
} from '$lib/server/scenes/records';
import { cueSchema } from '$lib/schemas/scene';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	const venue = requireRole(event);
	const found = await apiScene(event, venue.id);
	if (!found.ok) return found.response;
	return json({ cues: sceneJson(found.loaded).cues });
};

/** Adds one cue to the scene. */
export const POST: RequestHandler = async (event) => {
	const venue = requireRole(event, ...EDITORS);
	const found = await apiScene(event, venue.id);
	if (!found.ok) return found.response;
	const body = await readJson(event.request, cueSchema);
	if (!body.ok) return body.response;
	const { row, cues, responses } = found.loaded;
	const cue = { ...body.data, id: undefined };
	const context = await sceneContext(db, venue.id);
	const errors = refErrors(context, { roomId: null, triggerSensorId: null }, { cues: [cue] });
	if (Object.keys(errors).length) return refErrorResponse(errors);
	const names = new Map(context.outputs.map((o) => [o.id, o.name]));
	await saveScene(
		db,
		venue.id,
		event.locals.person!.id,
		found.loaded,
		sceneDetailsOf(row),
		{ cues: [...cues, cue], responses },
		(id) => names.get(id) ?? 'a removed output'
	);
	const loaded = await loadScene(db, venue.id, row.id);
	const before = new Set(cues.map((c) => c.id));
	const added = sceneJson(loaded!).cues.find((c) => !before.has(c.id));
	return json({ cue: added }, { status: 201 });
};
