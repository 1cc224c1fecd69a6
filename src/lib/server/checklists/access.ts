import { and, eq } from 'drizzle-orm';
import type { Role } from '$lib/roles';
import type { Db } from '$lib/server/db/client';
import { assignments, positions, rooms, shows } from '$lib/server/db/schema';

/** A post the person holds on the show: its room, and whether it is a safety post. */
export type ShowPost = { roomId: string | null; room: string | null; safetyPost: boolean };

export type ShowAccess =
	| { ok: true; show: typeof shows.$inferSelect; manages: boolean; posts: ShowPost[] }
	| { ok: false; status: 404 | 403; message: string };

const MANAGERS: Role[] = ['owner', 'show_manager'];

/**
 * Who may work a show's checklist: owners and show managers on every show of their venue, anyone
 * else only on shows they are assigned to. A show of another venue is simply not found.
 */
export async function showAccess(
	db: Db,
	venue: { id: string; role: Role },
	personId: string,
	showId: string
): Promise<ShowAccess> {
	const uuid = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
	if (!uuid.test(showId)) return { ok: false, status: 404, message: 'There is no such show.' };
	const [show] = await db
		.select()
		.from(shows)
		.where(and(eq(shows.id, showId), eq(shows.venueId, venue.id)));
	if (!show) return { ok: false, status: 404, message: 'There is no such show.' };
	if (MANAGERS.includes(venue.role)) return { ok: true, show, manages: true, posts: [] };
	const posts = await db
		.select({ roomId: positions.roomId, room: rooms.name, safetyPost: positions.safetyPost })
		.from(assignments)
		.innerJoin(positions, eq(positions.id, assignments.positionId))
		.leftJoin(rooms, and(eq(rooms.id, positions.roomId), eq(rooms.venueId, venue.id)))
		.where(
			and(
				eq(assignments.showId, show.id),
				eq(assignments.venueId, venue.id),
				eq(assignments.personId, personId)
			)
		);
	if (!posts.length)
		return {
			ok: false,
			status: 403,
			message: 'You can work the checklist only of shows you are assigned to.'
		};
	return { ok: true, show, manages: false, posts };
}
