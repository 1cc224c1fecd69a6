import { fail } from '@sveltejs/kit';
import { and, eq, gt, sql } from 'drizzle-orm';
import { nextDate, wallToInstant, crewCallAt } from '$lib/schedule';
import { PLANNERS, requireRole } from '$lib/server/auth/guard';
import { audit } from '$lib/server/audit';
import { db } from '$lib/server/db';
import { shows } from '$lib/server/db/schema';
import { keep, parseForm } from '$lib/server/forms';
import { feedsOf, resetFeed } from '$lib/server/schedule/feeds';
import { oneOffSchema } from '$lib/schemas/schedule';
import type { Actions, PageServerLoad } from './$types';
import { config } from '$lib/server/config';

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event);
	const [feeds, hours] = await Promise.all([
		feedsOf(db, event.locals.person!.id),
		// The week view opens at the hour of the earliest crew call among the coming nights.
		db
			.select({
				from: sql<
					string | null
				>`min(to_char(${shows.crewCall} at time zone ${venue.timeZone}, 'HH24:00:00'))`
			})
			.from(shows)
			.where(and(eq(shows.venueId, venue.id), gt(shows.doorsClose, new Date())))
	]);
	return {
		showHoursFrom: hours[0]?.from ?? '16:00:00',
		canEdit: PLANNERS.includes(venue.role),
		venueFeedMadeAt: feeds.find((f) => f.kind === 'venue' && f.venueId === venue.id)?.at ?? null
	};
};

export const actions: Actions = {
	addShow: async (event) => {
		const venue = requireRole(event, ...PLANNERS);
		const parsed = await parseForm(event.request, oneOffSchema);
		if (!parsed.ok)
			return fail(400, { action: 'addShow', values: keep(parsed.raw), errors: parsed.errors });
		const { date, doorsOpen, doorsClose, crewCallMinutesBefore, notes } = parsed.data;
		if (doorsOpen === doorsClose)
			return fail(400, {
				action: 'addShow',
				values: keep(parsed.raw),
				errors: { doorsClose: ['Doors open and close at the same time.'] }
			});
		const open = wallToInstant(date, doorsOpen, venue.timeZone);
		const [show] = await db
			.insert(shows)
			.values({
				venueId: venue.id,
				date,
				doorsOpen: open,
				doorsClose: wallToInstant(
					doorsClose < doorsOpen ? nextDate(date) : date,
					doorsClose,
					venue.timeZone
				),
				crewCall: crewCallAt(open, crewCallMinutesBefore),
				notes
			})
			.returning();
		await audit(db, {
			venueId: venue.id,
			personId: event.locals.person!.id,
			action: 'show.added',
			detail: { date, show: show.id }
		});
		return { action: 'addShow', saved: true, showId: show.id };
	},
	feed: async (event) => {
		const venue = requireRole(event, 'owner', 'show_manager', 'designer');
		const token = await resetFeed(db, event.locals.person!.id, 'venue', venue.id);
		return { action: 'feed', feedUrl: `${config.origin}/calendar/${token}.ics` };
	}
};
