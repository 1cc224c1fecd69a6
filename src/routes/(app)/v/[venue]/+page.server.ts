import { asc, count, eq } from 'drizzle-orm';
import { requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { memberships, rooms, venues } from '$lib/server/db/schema';
import {
	nextShow,
	showAssignments,
	showConflicts,
	listPositions
} from '$lib/server/schedule/shows';
import { localTime } from '$lib/util/when';
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
	const show = await nextShow(db, venue.id);
	let next = null;
	if (show) {
		const crew = await showAssignments(db, venue.id, show.id);
		const posts = await listPositions(db, venue.id);
		const mine = crew.filter((a) => a.personId === event.locals.person!.id);
		next = {
			id: show.id,
			date: show.date,
			status: show.status,
			openingNight: show.openingNight,
			crewCall: localTime(show.crewCall, venue.timeZone),
			doorsOpen: localTime(show.doorsOpen, venue.timeZone),
			doorsClose: localTime(show.doorsClose, venue.timeZone),
			assigned: crew.length,
			positions: posts.length,
			myCall: mine.length ? localTime(mine[0].callOverride ?? show.crewCall, venue.timeZone) : null,
			problems: venue.role === 'crew' ? 0 : (await showConflicts(db, venue.id, show.id)).length,
			canOpen: venue.role !== 'crew' || mine.length > 0
		};
	}
	return { details, rooms: roomList, memberCount: members.n, next };
};
