import { fail } from '@sveltejs/kit';
import { and, asc, eq, gte } from 'drizzle-orm';
import { requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { assignments, positions, shows, unavailability } from '$lib/server/db/schema';
import { parseForm } from '$lib/server/forms';
import { feedsOf, resetFeed } from '$lib/server/schedule/feeds';
import { dateSchema } from '$lib/schemas/schedule';
import { localDate, localTime } from '$lib/util/when';
import type { Actions, PageServerLoad } from './$types';
import { config } from '$lib/server/config';

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event);
	const person = event.locals.person!;
	const today = localDate(new Date(), venue.timeZone);
	const mine = await db
		.select({
			id: assignments.id,
			showId: shows.id,
			date: shows.date,
			status: shows.status,
			crewCall: shows.crewCall,
			callOverride: assignments.callOverride,
			doorsOpen: shows.doorsOpen,
			position: positions.name
		})
		.from(assignments)
		.innerJoin(shows, eq(shows.id, assignments.showId))
		.innerJoin(positions, eq(positions.id, assignments.positionId))
		.where(
			and(
				eq(assignments.venueId, venue.id),
				eq(assignments.personId, person.id),
				gte(shows.date, today)
			)
		)
		.orderBy(asc(shows.doorsOpen));
	const nights = await db
		.selectDistinct({ date: shows.date })
		.from(shows)
		.where(and(eq(shows.venueId, venue.id), eq(shows.status, 'scheduled'), gte(shows.date, today)))
		.orderBy(asc(shows.date))
		.limit(120);
	const away = await db
		.select({ date: unavailability.date })
		.from(unavailability)
		.where(and(eq(unavailability.venueId, venue.id), eq(unavailability.personId, person.id)));
	const feeds = await feedsOf(db, person.id);
	return {
		mine: mine.map((m) => ({
			id: m.id,
			showId: m.showId,
			date: m.date,
			status: m.status,
			position: m.position,
			call: localTime(m.callOverride ?? m.crewCall, venue.timeZone, venue.clock),
			doorsOpen: localTime(m.doorsOpen, venue.timeZone, venue.clock)
		})),
		nights: nights.map((n) => n.date),
		away: away.map((a) => a.date),
		feedMadeAt: feeds.find((f) => f.kind === 'person')?.at ?? null
	};
};

export const actions: Actions = {
	away: async (event) => {
		const venue = requireRole(event);
		const parsed = await parseForm(event.request, dateSchema);
		if (!parsed.ok) return fail(400, { action: 'away', message: parsed.errors.date?.[0] });
		await db
			.insert(unavailability)
			.values({ venueId: venue.id, personId: event.locals.person!.id, date: parsed.data.date })
			.onConflictDoNothing();
		return { action: 'away', saved: true };
	},
	available: async (event) => {
		const venue = requireRole(event);
		const parsed = await parseForm(event.request, dateSchema);
		if (!parsed.ok) return fail(400, { action: 'available', message: parsed.errors.date?.[0] });
		const done = await db
			.delete(unavailability)
			.where(
				and(
					eq(unavailability.venueId, venue.id),
					eq(unavailability.personId, event.locals.person!.id),
					eq(unavailability.date, parsed.data.date)
				)
			)
			.returning({ id: unavailability.id });
		if (!done.length)
			return fail(404, {
				action: 'available',
				message: 'You were not marked away on that night.'
			});
		return { action: 'available', saved: true };
	},
	feed: async (event) => {
		requireRole(event);
		const token = await resetFeed(db, event.locals.person!.id, 'person');
		return { action: 'feed', feedUrl: `${config.origin}/calendar/${token}.ics` };
	}
};
