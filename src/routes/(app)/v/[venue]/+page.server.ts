import { asc, count, eq } from 'drizzle-orm';
import { requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { memberships, rooms, venues } from '$lib/server/db/schema';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event);
	const [details] = await db.select().from(venues).where(eq(venues.id, venue.id));
	const roomList = await db
		.select({ id: rooms.id, name: rooms.name })
		.from(rooms)
		.where(eq(rooms.venueId, venue.id))
		.orderBy(asc(rooms.position), asc(rooms.name));
	const [members] = await db
		.select({ n: count() })
		.from(memberships)
		.where(eq(memberships.venueId, venue.id));
	return { details, rooms: roomList, memberCount: members.n };
};
