import { createHash, randomBytes } from 'node:crypto';
import { and, asc, eq, inArray, isNull } from 'drizzle-orm';
import { buildCalendar, showTimesText, type CalendarEvent } from '../../schedule';
import type { Db } from '../db/client';
import { assignments, calendarFeeds, memberships, positions, shows, venues } from '../db/schema';

export function hashFeedToken(token: string) {
	return createHash('sha256').update(token).digest('hex');
}

/**
 * A new feed link for a person (their calls in every venue) or a venue (its shows). Any earlier
 * link of the same kind stops working. The token is returned once; only its hash is stored.
 */
export async function resetFeed(
	db: Db,
	personId: string,
	kind: 'person' | 'venue',
	venueId: string | null = null
) {
	const token = randomBytes(32).toString('base64url');
	await db.transaction(async (tx) => {
		await tx
			.delete(calendarFeeds)
			.where(
				and(
					eq(calendarFeeds.personId, personId),
					eq(calendarFeeds.kind, kind),
					venueId === null ? isNull(calendarFeeds.venueId) : eq(calendarFeeds.venueId, venueId)
				)
			);
		await tx
			.insert(calendarFeeds)
			.values({ kind, personId, venueId, tokenHash: hashFeedToken(token), resetAt: new Date() });
	});
	return token;
}

export async function feedsOf(db: Db, personId: string) {
	return db
		.select({ kind: calendarFeeds.kind, venueId: calendarFeeds.venueId, at: calendarFeeds.resetAt })
		.from(calendarFeeds)
		.where(eq(calendarFeeds.personId, personId));
}

const TOKEN = /^[A-Za-z0-9_-]{20,100}$/;

/** The ICS text for a feed token, or null when the token is unknown. */
export async function feedCalendar(db: Db, token: string, origin: string) {
	if (!TOKEN.test(token)) return null;
	const [feed] = await db
		.select()
		.from(calendarFeeds)
		.where(eq(calendarFeeds.tokenHash, hashFeedToken(token)));
	if (!feed) return null;
	const host = new URL(origin).host;
	const events: CalendarEvent[] = [];
	if (feed.kind === 'venue') {
		if (!feed.venueId) return null;
		// A venue link stops working when the person who made it leaves the venue, and shows what
		// their role today may see: crew see the nights they are on, as in the calendar.
		const [member] = await db
			.select({ role: memberships.role })
			.from(memberships)
			.where(and(eq(memberships.venueId, feed.venueId), eq(memberships.personId, feed.personId)));
		if (!member) return null;
		const theirs = db
			.select({ id: assignments.showId })
			.from(assignments)
			.where(and(eq(assignments.venueId, feed.venueId), eq(assignments.personId, feed.personId)));
		const rows = await db
			.select({
				show: shows,
				venueName: venues.name,
				slug: venues.slug,
				timeZone: venues.timeZone,
				clock: venues.clock
			})
			.from(shows)
			.innerJoin(venues, eq(venues.id, shows.venueId))
			.where(
				and(
					eq(shows.venueId, feed.venueId),
					member.role === 'crew' ? inArray(shows.id, theirs) : undefined
				)
			)
			.orderBy(asc(shows.doorsOpen));
		for (const { show, venueName, slug, timeZone, clock } of rows) {
			if (show.status === 'dark') continue;
			events.push({
				uid: `show-${show.id}@${host}`,
				start: show.doorsOpen,
				end: show.doorsClose,
				summary: `${show.openingNight ? 'Opening night' : 'Show'}: ${venueName}`,
				description: showTimesText(show, timeZone, clock),
				cancelled: show.status === 'cancelled',
				sequence: show.sequence,
				url: `${origin}/v/${slug}/shows/${show.id}`
			});
		}
		return buildCalendar(events, { name: rows[0]?.venueName ?? 'Shows' });
	}
	// A person's link covers the venues they belong to today; with none, it no longer works.
	const venuesOf = await db
		.select({ venueId: memberships.venueId })
		.from(memberships)
		.where(eq(memberships.personId, feed.personId));
	if (!venuesOf.length) return null;
	const rows = await db
		.select({
			id: assignments.id,
			callOverride: assignments.callOverride,
			position: positions.name,
			show: shows,
			venueName: venues.name,
			slug: venues.slug,
			timeZone: venues.timeZone,
			clock: venues.clock
		})
		.from(assignments)
		.innerJoin(shows, eq(shows.id, assignments.showId))
		.innerJoin(positions, eq(positions.id, assignments.positionId))
		.innerJoin(venues, eq(venues.id, assignments.venueId))
		.innerJoin(
			memberships,
			and(
				eq(memberships.venueId, assignments.venueId),
				eq(memberships.personId, assignments.personId)
			)
		)
		.where(eq(assignments.personId, feed.personId))
		.orderBy(asc(shows.doorsOpen));
	for (const r of rows) {
		if (r.show.status === 'dark') continue;
		events.push({
			uid: `call-${r.id}@${host}`,
			start: r.callOverride ?? r.show.crewCall,
			end: r.show.doorsClose,
			summary: `Crew call: ${r.position}, ${r.venueName}`,
			description: showTimesText(
				{ ...r.show, crewCall: r.callOverride ?? r.show.crewCall },
				r.timeZone,
				r.clock
			),
			cancelled: r.show.status === 'cancelled',
			sequence: r.show.sequence,
			url: `${origin}/v/${r.slug}/shows/${r.show.id}`
		});
	}
	return buildCalendar(events, { name: 'My crew calls' });
}
