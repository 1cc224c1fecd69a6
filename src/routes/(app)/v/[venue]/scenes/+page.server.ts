import { EDITORS, requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { listScenes } from '$lib/server/scenes/records';
import { brightenAction, duplicateAction } from './scene-actions.server';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event);
	const list = await listScenes(db, venue.id);
	const groups = [...list.rooms, { id: null, name: 'No room' }]
		.map((room) => ({ room, scenes: list.scenes.filter((s) => s.roomId === room.id) }))
		.filter((g) => g.scenes.length > 0);
	return { groups, total: list.scenes.length, canEdit: EDITORS.includes(venue.role) };
};

export const actions: Actions = {
	duplicate: (event) => {
		requireRole(event, ...EDITORS);
		return duplicateAction(event);
	},
	brighten: (event) => {
		requireRole(event, ...EDITORS);
		return brightenAction(event);
	}
};
