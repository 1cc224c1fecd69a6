import { error, fail, redirect } from '@sveltejs/kit';
import { asc, eq } from 'drizzle-orm';
import { PLANNERS, requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { memberships, rooms, users } from '$lib/server/db/schema';
import { keep, parseForm } from '$lib/server/forms';
import {
	closeIncident,
	followUpIncident,
	incidentAccess,
	listIncidents,
	nightSpan,
	reportIncident,
	type IncidentOutcome
} from '$lib/server/incidents/records';
import {
	incidentCloseSchema,
	incidentFollowUpSchema,
	incidentReportSchema
} from '$lib/schemas/incident';
import { localDate, localTime } from '$lib/util/when';
import type { Actions, PageServerLoad, RequestEvent } from './$types';

/** The night, if the person may open its incidents (see incidentAccess), or their 403 / 404. */
async function nightFor(
	event: Pick<RequestEvent, 'locals' | 'params'>,
	venue: ReturnType<typeof requireRole>
) {
	const found = await incidentAccess(db, venue, event.locals.person!.id, event.params.show);
	if (!found.ok) error(found.status, found.message);
	return found;
}

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event);
	const { show, manages, posts, onlyFollowUps } = await nightFor(event, venue);
	const me = event.locals.person!.id;
	const tz = venue.timeZone;
	const [list, roomList, members] = await Promise.all([
		listIncidents(db, venue.id, {
			showIds: [show.id],
			followUpBy: onlyFollowUps ? me : undefined
		}),
		db
			.select({ id: rooms.id, name: rooms.name })
			.from(rooms)
			.where(eq(rooms.venueId, venue.id))
			.orderBy(asc(rooms.position), asc(rooms.name)),
		db
			.select({ id: users.id, name: users.name, email: users.email })
			.from(memberships)
			.innerJoin(users, eq(users.id, memberships.personId))
			.where(eq(memberships.venueId, venue.id))
			.orderBy(asc(users.name))
	]);
	// The time field starts at now on the night, or at doors open when the night is not now.
	const span = nightSpan(show);
	const now = new Date();
	const start = now >= span.from && now <= span.to ? now : show.doorsOpen;
	const myRoom = posts.find((p) => p.roomId)?.roomId ?? '';
	return {
		show: {
			id: show.id,
			date: show.date,
			doorsOpen: localTime(show.doorsOpen, tz, venue.clock),
			doorsClose: localTime(show.doorsClose, tz, venue.clock)
		},
		incidents: list.map((i) => ({
			...i,
			canFollowUp: !i.closed && (manages || i.followUpById === me)
		})),
		rooms: roomList,
		members: members.map((m) => ({ id: m.id, name: m.name ?? m.email })),
		defaults: {
			happenedAt: `${localDate(start, tz)}T${localTime(start, tz, '24h')}`,
			roomId: myRoom
		},
		canReport: !onlyFollowUps,
		canClose: PLANNERS.includes(venue.role)
	};
};

function answer(outcome: IncidentOutcome, raw: Record<string, unknown>, event: RequestEvent) {
	if (!outcome.ok)
		return fail(outcome.status, {
			values: keep(raw),
			errors: { [outcome.field]: [outcome.message] },
			message: outcome.message
		});
	redirect(303, `${event.url.pathname}#incident-${outcome.id}`);
}

export const actions: Actions = {
	report: async (event) => {
		const venue = requireRole(event);
		const { show, onlyFollowUps } = await nightFor(event, venue);
		if (onlyFollowUps)
			error(403, 'Incidents on this night are reported by the crew on it and by show managers.');
		const parsed = await parseForm(event.request, incidentReportSchema);
		if (!parsed.ok) return fail(400, { values: keep(parsed.raw), errors: parsed.errors });
		const done = await reportIncident(db, venue, event.locals.person!.id, show, parsed.data);
		return answer(done, parsed.raw, event);
	},
	followUp: async (event) => {
		const venue = requireRole(event);
		const { show } = await nightFor(event, venue);
		const parsed = await parseForm(event.request, incidentFollowUpSchema);
		if (!parsed.ok) return fail(400, { values: keep(parsed.raw), errors: parsed.errors });
		const done = await followUpIncident(db, venue, event.locals.person!.id, show, parsed.data);
		return answer(done, parsed.raw, event);
	},
	close: async (event) => {
		const venue = requireRole(event, ...PLANNERS);
		const { show } = await nightFor(event, venue);
		const parsed = await parseForm(event.request, incidentCloseSchema);
		if (!parsed.ok) return fail(400, { values: keep(parsed.raw), errors: parsed.errors });
		const done = await closeIncident(db, venue.id, event.locals.person!.id, show, parsed.data);
		return answer(done, parsed.raw, event);
	}
};
