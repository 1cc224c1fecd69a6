import { error, json } from '@sveltejs/kit';
import { and, eq } from 'drizzle-orm';
import { formatDate, instantToWall, nextDate, parseDate, wallToInstant } from '$lib/schedule';
import { PLANNERS, requireRole } from '$lib/server/auth/guard';
import { audit } from '$lib/server/audit';
import { db } from '$lib/server/db';
import { assignments, positions, seasons, shows } from '$lib/server/db/schema';
import { showsBetween } from '$lib/server/schedule/shows';
import { calendarRangeSchema, moveShowSchema } from '$lib/schemas/schedule';
import type { RequestHandler } from './$types';

export interface CalendarItem {
	id: string;
	/** Timed items: an ISO instant with Z. All-day items (dark nights): the venue's date. */
	kind: 'show' | 'call' | 'dark';
	start: string;
	end: string;
	title: string;
	allDay: boolean;
	showId?: string;
	oneOff?: boolean;
	status?: string;
}

/** Shows, crew calls and dark nights in a range. Crew see only their own calls. */
export const GET: RequestHandler = async (event) => {
	const venue = requireRole(event);
	const range = calendarRangeSchema.safeParse({
		start: event.url.searchParams.get('start'),
		end: event.url.searchParams.get('end')
	});
	if (!range.success) error(400, range.error.issues[0]?.message ?? 'Give start and end dates.');
	const tz = venue.timeZone;
	const from = range.data.start;
	const to = range.data.end;
	const start = wallToInstant(from, '00:00', tz);
	const end = wallToInstant(to, '00:00', tz);
	// Timed items go out as instants (UTC); the page turns them into the venue's wall clock, since
	// the calendar component knows fixed offsets only. All-day items are the venue's dates.
	const wall = (at: Date) => at.toISOString();
	const person = event.locals.person!;
	const items: CalendarItem[] = [];
	const [found, seasonList] = await Promise.all([
		showsBetween(db, venue.id, start, end),
		db
			.select({ id: seasons.id, name: seasons.name, dark: seasons.darkNights })
			.from(seasons)
			.where(eq(seasons.venueId, venue.id))
	]);
	let list = found;
	// Each night says which season it belongs to, so two seasons side by side are told apart.
	const seasonName = new Map(seasonList.map((s) => [s.id, s.name]));
	// What the night is comes first, so a narrow day cell still shows it when the name is cut short.
	const of = (what: string, seasonId: string | null) =>
		seasonId
			? `${what} · ${seasonName.get(seasonId) ?? 'a season'}`
			: `One-off ${what.toLowerCase()}`;
	if (venue.role === 'crew') {
		const mine = await db
			.select({
				showId: assignments.showId,
				position: positions.name,
				call: assignments.callOverride
			})
			.from(assignments)
			.innerJoin(positions, eq(positions.id, assignments.positionId))
			.where(and(eq(assignments.venueId, venue.id), eq(assignments.personId, person.id)));
		const byShow = new Map(mine.map((m) => [m.showId, m]));
		list = list.filter((s) => byShow.has(s.id));
		for (const s of list) {
			const m = byShow.get(s.id)!;
			items.push({
				id: `call-${s.id}`,
				kind: 'call',
				start: wall(m.call ?? s.crewCall),
				end: wall(s.doorsOpen),
				title: `My call: ${m.position}`,
				allDay: false,
				showId: s.id
			});
		}
	}
	for (const s of list) {
		if (s.status === 'dark') {
			items.push({
				id: `dark-${s.id}`,
				kind: 'dark',
				start: s.date,
				end: nextDate(s.date),
				title: of('Dark night', s.seasonId),
				allDay: true,
				showId: s.id
			});
			continue;
		}
		items.push({
			id: `show-${s.id}`,
			kind: 'show',
			start: wall(s.doorsOpen),
			end: wall(s.doorsClose),
			title: `${of(s.openingNight ? 'Opening night' : 'Show', s.seasonId)}${s.status === 'cancelled' ? ' (cancelled)' : ''}`,
			allDay: false,
			showId: s.id,
			oneOff: s.seasonId === null,
			status: s.status
		});
		if (venue.role !== 'crew' && s.status === 'scheduled') {
			items.push({
				id: `call-${s.id}`,
				kind: 'call',
				start: wall(s.crewCall),
				end: wall(s.doorsOpen),
				title: 'Crew call',
				allDay: false,
				showId: s.id
			});
		}
	}
	if (venue.role !== 'crew') {
		for (const season of seasonList) {
			for (const d of season.dark) {
				if (d >= from && d < to) {
					items.push({
						id: `dark-${season.id}-${d}`,
						kind: 'dark',
						start: d,
						end: nextDate(d),
						title: `Dark night · ${season.name}`,
						allDay: true
					});
				}
			}
		}
	}
	return json({ timeZone: venue.timeZone, items });
};

/** Moves a one-off show to another date, keeping its local times. */
export const POST: RequestHandler = async (event) => {
	const venue = requireRole(event, ...PLANNERS);
	const body = await event.request.json().catch(() => null);
	const parsed = moveShowSchema.safeParse(body);
	if (!parsed.success) error(400, parsed.error.issues[0]?.message ?? 'Give a show and a date.');
	const { showId, date } = parsed.data;
	const [show] = await db
		.select()
		.from(shows)
		.where(and(eq(shows.id, showId), eq(shows.venueId, venue.id)));
	if (!show) error(404, 'That show no longer exists.');
	if (show.seasonId !== null)
		error(400, 'Only one-off shows can be moved; change the season instead.');
	const days = Math.round(
		(parseDate(date)!.getTime() - parseDate(show.date)!.getTime()) / 86_400_000
	);
	// Keep each local wall time: the same clock time, the same number of days later.
	const shift = (at: Date) => {
		const wall = instantToWall(at, venue.timeZone);
		const moved = formatDate(
			new Date(Date.UTC(wall.getUTCFullYear(), wall.getUTCMonth(), wall.getUTCDate() + days))
		);
		return wallToInstant(moved, wall.toISOString().slice(11, 16), venue.timeZone);
	};
	await db
		.update(shows)
		.set({
			date,
			doorsOpen: shift(show.doorsOpen),
			doorsClose: shift(show.doorsClose),
			crewCall: shift(show.crewCall),
			edited: true,
			editedAt: new Date(),
			editedBy: event.locals.person!.id,
			sequence: show.sequence + 1
		})
		.where(and(eq(shows.id, show.id), eq(shows.venueId, venue.id)));
	await audit(db, {
		venueId: venue.id,
		personId: event.locals.person!.id,
		action: 'show.moved',
		detail: { from: show.date, to: date }
	});
	return json({ moved: true });
};
