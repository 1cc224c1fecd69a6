import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { apiScene } from '$lib/server/scenes/api';
import { analyseWith, sceneContext } from '$lib/server/scenes/records';
import type { RequestHandler } from './$types';

/** The checks of a scene: findings, cycle, throughput, peak currents and whether signage is needed. */
export const GET: RequestHandler = async (event) => {
	const venue = requireRole(event);
	const found = await apiScene(event, venue.id);
	if (!found.ok) return found.response;
	const analysis = analyseWith(await sceneContext(db, venue.id), found.loaded.scene);
	return json({ sceneId: found.loaded.row.id, ...analysis });
};
