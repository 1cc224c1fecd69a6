import { json } from '@sveltejs/kit';
import { asc, eq } from 'drizzle-orm';
import { requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { rooms } from '$lib/server/db/schema';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	const venue = requireRole(event);
	const list = await db
		.select({ id: rooms.id, name: rooms.name, notes: rooms.notes })
		.from(rooms)
		.where(eq(rooms.venueId, venue.id))
		.orderBy(asc(rooms.position), asc(rooms.name));
	return json({ rooms: list });
};
