import { requireRole, EDITORS } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { listProps, venueRooms } from '$lib/server/props/queries';
import { propQuerySchema } from '$lib/schemas/prop';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event);
	const query = propQuerySchema.parse(Object.fromEntries(event.url.searchParams));
	const [list, rooms] = await Promise.all([
		listProps(db, venue.id, query),
		venueRooms(db, venue.id)
	]);
	return { ...list, query, rooms, canEdit: EDITORS.includes(venue.role) };
};
