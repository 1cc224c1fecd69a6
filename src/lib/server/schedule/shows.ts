import { and, asc, eq, gt, inArray, lt, ne } from 'drizzle-orm';
import { findDoubleBookings, type CrewAssignment } from '../../schedule';
import type { Db } from '../db/client';
import { localDay } from '../../util/when';
import { assignments, positions, rooms, shows, unavailability, users, venues } from '../db/schema';

export function getShow(db: Db, venueId: string, showId: string) {
	return db
		.select()
		.from(shows)
		.where(and(eq(shows.venueId, venueId), eq(shows.id, showId)))
		.then((r) => r[0] ?? null);
}

export function listPositions(db: Db, venueId: string) {
	return db
		.select({
			id: positions.id,
			name: positions.name,
			required: positions.required,
			safetyPost: positions.safetyPost,
			headcount: positions.headcount,
			roomId: positions.roomId,
			roomName: rooms.name
		})
		.from(positions)
		.leftJoin(rooms, and(eq(rooms.id, positions.roomId), eq(rooms.venueId, venueId)))
		.where(eq(positions.venueId, venueId))
		.orderBy(asc(positions.name));
}

export function showAssignments(db: Db, venueId: string, showId: string) {
	return db
		.select({
			id: assignments.id,
			positionId: assignments.positionId,
			personId: assignments.personId,
			personName: users.name,
			personEmail: users.email,
			callOverride: assignments.callOverride
		})
		.from(assignments)
		.innerJoin(users, eq(users.id, assignments.personId))
		.where(and(eq(assignments.venueId, venueId), eq(assignments.showId, showId)));
}

export type ConflictKind = 'double_booked' | 'unfilled' | 'unavailable';
export interface Conflict {
	kind: ConflictKind;
	message: string;
	personId?: string;
	positionId?: string;
	/** The other show of a double-booking, when it is in this venue: a link to open it. */
	href?: string;
}

/**
 * Problems with one show's crew: a person at two posts whose times overlap (in this venue or
 * another), a required position with nobody, a person working a night they said they cannot.
 */
export async function showConflicts(
	db: Db,
	venueId: string,
	showId: string,
	known: { show?: typeof shows.$inferSelect } = {}
): Promise<Conflict[]> {
	const [show, here, posts] = await Promise.all([
		known.show ?? getShow(db, venueId, showId),
		showAssignments(db, venueId, showId),
		listPositions(db, venueId)
	]);
	if (!show) return [];
	const conflicts: Conflict[] = [];
	if (show.status === 'scheduled') {
		for (const p of posts) {
			if (!p.required) continue;
			const filled = here.filter((a) => a.positionId === p.id).length;
			if (filled >= p.headcount) continue;
			conflicts.push({
				kind: 'unfilled',
				positionId: p.id,
				message: !filled
					? `${p.name} is required and nobody is assigned.`
					: `${p.name} needs ${p.headcount} people and has ${filled}.`
			});
		}
	}
	const people = [...new Set(here.map((a) => a.personId))];
	if (!people.length || show.status !== 'scheduled') return conflicts;
	const name = new Map(here.map((a) => [a.personId, a.personName ?? a.personEmail]));

	// Every assignment of these people, in any venue, on shows that overlap this one's night.
	const windowStart = new Date(show.crewCall.getTime() - 86_400_000);
	const windowEnd = show.doorsClose;
	const theirsQuery = db
		.select({
			id: assignments.id,
			personId: assignments.personId,
			showId: assignments.showId,
			venueId: assignments.venueId,
			venueName: venues.name,
			venueSlug: venues.slug,
			positionName: positions.name,
			showDate: shows.date,
			callOverride: assignments.callOverride,
			crewCall: shows.crewCall,
			doorsClose: shows.doorsClose
		})
		.from(assignments)
		.innerJoin(shows, eq(shows.id, assignments.showId))
		.innerJoin(venues, eq(venues.id, assignments.venueId))
		.leftJoin(positions, eq(positions.id, assignments.positionId))
		.where(
			and(
				inArray(assignments.personId, people),
				eq(shows.status, 'scheduled'),
				lt(shows.crewCall, windowEnd),
				gt(shows.doorsClose, windowStart)
			)
		);
	const awayQuery = db
		.select({ personId: unavailability.personId })
		.from(unavailability)
		.where(
			and(
				eq(unavailability.venueId, venueId),
				eq(unavailability.date, show.date),
				inArray(unavailability.personId, people)
			)
		);
	const [theirs, away] = await Promise.all([theirsQuery, awayQuery]);
	const byId = new Map(theirs.map((a) => [a.id, a]));
	const postOf = (id: string | undefined) => {
		const post = id ? byId.get(id)?.positionName : null;
		return post ? `as ${post}` : 'with no position';
	};
	const crew: CrewAssignment[] = theirs.map((a) => ({
		id: a.id,
		personId: a.personId,
		showId: a.showId,
		venueId: a.venueId,
		callAt: a.callOverride ?? a.crewCall,
		endsAt: a.doorsClose
	}));
	const seen = new Set<string>();
	for (const b of findDoubleBookings(crew)) {
		if (b.first.showId !== showId && b.second.showId !== showId) continue;
		const other = b.first.showId === showId ? b.second : b.first;
		const key = `${b.personId}:${other.id}`;
		if (seen.has(key)) continue;
		seen.add(key);
		const mine = b.first.showId === showId ? b.first : b.second;
		const row = byId.get(other.id!)!;
		const here = row.venueId === venueId;
		const where = b.sameShow
			? `${postOf(other.id)} too, in this show`
			: here
				? `${postOf(other.id)} at the show on ${localDay(row.showDate)} at the same time`
				: `${postOf(other.id)} at ${row.venueName} on ${localDay(row.showDate)} at the same time`;
		conflicts.push({
			kind: 'double_booked',
			personId: b.personId,
			message: `${name.get(b.personId)} is assigned ${postOf(mine.id)} here and also ${where}.`,
			...(here && !b.sameShow ? { href: `/v/${row.venueSlug}/shows/${row.showId}` } : {})
		});
	}

	for (const a of away) {
		conflicts.push({
			kind: 'unavailable',
			personId: a.personId,
			message: `${name.get(a.personId)} marked this night as one they cannot work.`
		});
	}
	return conflicts;
}

/** Scheduled shows of a venue overlapping [from, to), for the calendar. */
export function showsBetween(db: Db, venueId: string, from: Date, to: Date) {
	return db
		.select()
		.from(shows)
		.where(and(eq(shows.venueId, venueId), lt(shows.crewCall, to), gt(shows.doorsClose, from)))
		.orderBy(asc(shows.doorsOpen));
}

/** The next show that has not finished yet, scheduled or not. */
export function nextShow(db: Db, venueId: string, now = new Date()) {
	return db
		.select()
		.from(shows)
		.where(and(eq(shows.venueId, venueId), gt(shows.doorsClose, now), ne(shows.status, 'dark')))
		.orderBy(asc(shows.doorsOpen))
		.limit(1)
		.then((r) => r[0] ?? null);
}
