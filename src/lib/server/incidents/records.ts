// Incidents and show stops on a night: reported by anyone on the night (crew from a phone),
// followed up by show managers, owners and the incident's follow-up owner, closed with a closing
// note by show managers and owners. Every step is a new row (incidents and incident_events are
// append-only), written with its Activity line in one transaction, under the incident's row lock.
import { and, asc, eq, sql } from 'drizzle-orm';
import { anyText, anyUuid } from '$lib/server/db/any';
import type { z } from 'zod';
import { wallToInstant } from '$lib/schedule';
import type { Role } from '$lib/roles';
import type { Db } from '$lib/server/db/client';
import { audit } from '$lib/server/audit';
import { isUniqueViolation } from '$lib/server/db/errors';
import { incidentEvents, incidents, memberships, rooms, shows, users } from '$lib/server/db/schema';
import { showAccess, type ShowAccess } from '$lib/server/checklists/access';
import type { IncidentEventKind, IncidentKind } from '$lib/schemas/incident-words';
import type {
	incidentCloseSchema,
	incidentFollowUpSchema,
	incidentReportSchema
} from '$lib/schemas/incident';
import { localDateTime, type Clock } from '$lib/util/when';

type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];
type Show = typeof shows.$inferSelect;
export type IncidentOutcome =
	{ ok: true; id: string } | { ok: false; status: number; field: string; message: string };

const refuse = (status: number, field: string, message: string): IncidentOutcome => ({
	ok: false,
	status,
	field,
	message
});

/** Roles that close incidents and follow up any of them. */
export const INCIDENT_MANAGERS: Role[] = ['owner', 'show_manager'];

/** How far either side of the night a reported time may fall. */
const NIGHT_MARGIN_MS = 12 * 3_600_000;

/** The span a night's incidents may fall in: from crew call (or doors) − 12 h to doors close + 12 h. */
export function nightSpan(show: Pick<Show, 'crewCall' | 'doorsOpen' | 'doorsClose'>) {
	const start = Math.min(show.crewCall.getTime(), show.doorsOpen.getTime());
	return {
		from: new Date(start - NIGHT_MARGIN_MS),
		to: new Date(show.doorsClose.getTime() + NIGHT_MARGIN_MS)
	};
}

export type IncidentAccess =
	| (Extract<ShowAccess, { ok: true }> & { onlyFollowUps: boolean })
	| Extract<ShowAccess, { ok: false }>;

/**
 * Who may open a night's incidents: owners and show managers on every night, anyone assigned to
 * the night, and a follow-up owner not on the night for the incidents they follow up only.
 */
export async function incidentAccess(
	db: Db,
	venue: { id: string; role: Role },
	personId: string,
	showId: string
): Promise<IncidentAccess> {
	const access = await showAccess(db, venue, personId, showId);
	if (access.ok) return { ...access, onlyFollowUps: false };
	if (access.status !== 403) return access;
	const [show] = await db
		.select()
		.from(shows)
		.where(and(eq(shows.id, showId), eq(shows.venueId, venue.id)));
	const [own] = show
		? await db
				.select({ id: incidents.id })
				.from(incidents)
				.where(
					and(
						eq(incidents.venueId, venue.id),
						eq(incidents.showId, show.id),
						eq(incidents.followUpBy, personId)
					)
				)
				.limit(1)
		: [];
	if (!show || !own)
		return {
			ok: false,
			status: 403,
			message: 'Incidents are read by show managers, owners and the crew on the night.'
		};
	return { ok: true, show, manages: false, posts: [], onlyFollowUps: true };
}

async function isMember(db: Db | Tx, venueId: string, personId: string) {
	const [row] = await db
		.select({ id: memberships.id })
		.from(memberships)
		.where(and(eq(memberships.venueId, venueId), eq(memberships.personId, personId)));
	return Boolean(row);
}

export async function reportIncident(
	db: Db,
	venue: { id: string; timeZone: string; clock: Clock },
	personId: string,
	show: Show,
	input: z.infer<typeof incidentReportSchema>
): Promise<IncidentOutcome> {
	const tz = venue.timeZone;
	const happenedAt = wallToInstant(input.happenedAt.date, input.happenedAt.time, tz);
	const span = nightSpan(show);
	if (happenedAt < span.from || happenedAt > span.to)
		return refuse(
			400,
			'happenedAt',
			`That time is not on this night: give a time from ${localDateTime(span.from, tz, venue.clock)} to ${localDateTime(span.to, tz, venue.clock)}.`
		);
	if (input.roomId) {
		const [room] = await db
			.select({ id: rooms.id })
			.from(rooms)
			.where(and(eq(rooms.id, input.roomId), eq(rooms.venueId, venue.id)));
		if (!room) return refuse(400, 'roomId', 'That room is no longer in this venue; pick another.');
	}
	if (input.followUpBy && !(await isMember(db, venue.id, input.followUpBy)))
		return refuse(400, 'followUpBy', 'Pick a member of this venue to follow it up.');
	const id = await db.transaction(async (tx) => {
		const [row] = await tx
			.insert(incidents)
			.values({
				venueId: venue.id,
				showId: show.id,
				roomId: input.roomId ?? null,
				kind: input.kind,
				happenedAt,
				whatHappened: input.whatHappened,
				whatWasDone: input.whatWasDone,
				firstAid: input.firstAid === 'yes',
				firstAidGiven: input.firstAid === 'yes' ? (input.firstAidGiven ?? null) : null,
				stoppedMinutes: input.stoppedMinutes,
				followUpBy: input.followUpBy ?? null,
				personId
			})
			.returning({ id: incidents.id });
		await audit(tx, {
			venueId: venue.id,
			personId,
			action: 'incident.reported',
			detail: {
				show: show.id,
				date: show.date,
				incident: row.id,
				kind: input.kind,
				stoppedMinutes: input.stoppedMinutes
			}
		});
		return row.id;
	});
	return { ok: true, id };
}

/** The incident under its row lock, with whether it is closed; null when it is not this night's. */
async function lockIncident(tx: Tx, venueId: string, showId: string, incidentId: string) {
	const [incident] = await tx
		.select()
		.from(incidents)
		.where(
			and(
				eq(incidents.id, incidentId),
				eq(incidents.venueId, venueId),
				eq(incidents.showId, showId)
			)
		)
		.for('update');
	if (!incident) return null;
	const [closed] = await tx
		.select({ id: incidentEvents.id })
		.from(incidentEvents)
		.where(and(eq(incidentEvents.incidentId, incident.id), eq(incidentEvents.kind, 'closed')));
	return { incident, closed: Boolean(closed) };
}

const GONE = 'That incident is not on this night.';
const CLOSED = 'That incident is already closed.';

/** A follow-up note, by a show manager or owner, or by the incident's follow-up owner. */
export async function followUpIncident(
	db: Db,
	venue: { id: string; role: Role },
	personId: string,
	show: Show,
	input: z.infer<typeof incidentFollowUpSchema>
): Promise<IncidentOutcome> {
	return db.transaction(async (tx) => {
		const found = await lockIncident(tx, venue.id, show.id, input.incidentId);
		if (!found) return refuse(404, 'incidentId', GONE);
		const manages = INCIDENT_MANAGERS.includes(venue.role);
		if (!manages && found.incident.followUpBy !== personId)
			return refuse(
				403,
				'note',
				'Follow-up notes are written by show managers, owners and the incident’s follow-up owner.'
			);
		if (found.closed) return refuse(400, 'note', `${CLOSED} Its notes stay as they are.`);
		await tx.insert(incidentEvents).values({
			venueId: venue.id,
			incidentId: found.incident.id,
			kind: 'follow_up',
			note: input.note,
			personId
		});
		await audit(tx, {
			venueId: venue.id,
			personId,
			action: 'incident.followed_up',
			detail: {
				show: show.id,
				date: show.date,
				incident: found.incident.id,
				kind: found.incident.kind
			}
		});
		return { ok: true, id: found.incident.id };
	});
}

/** Close an incident with its closing note; the route lets only show managers and owners here. */
export async function closeIncident(
	db: Db,
	venueId: string,
	personId: string,
	show: Show,
	input: z.infer<typeof incidentCloseSchema>
): Promise<IncidentOutcome> {
	try {
		return await db.transaction(async (tx) => {
			const found = await lockIncident(tx, venueId, show.id, input.incidentId);
			if (!found) return refuse(404, 'incidentId', GONE);
			if (found.closed) return refuse(400, 'note', CLOSED);
			await tx.insert(incidentEvents).values({
				venueId,
				incidentId: found.incident.id,
				kind: 'closed',
				note: input.note,
				personId
			});
			await audit(tx, {
				venueId,
				personId,
				action: 'incident.closed',
				detail: {
					show: show.id,
					date: show.date,
					incident: found.incident.id,
					kind: found.incident.kind
				}
			});
			return { ok: true, id: found.incident.id } as const;
		});
	} catch (e) {
		// Two closes at once: the second meets the one-close index.
		if (isUniqueViolation(e)) return refuse(400, 'note', CLOSED);
		throw e;
	}
}

export interface IncidentView {
	id: string;
	showId: string;
	showDate: string;
	kind: IncidentKind;
	happenedAt: Date;
	roomName: string | null;
	whatHappened: string;
	whatWasDone: string;
	firstAid: boolean;
	firstAidGiven: string | null;
	stoppedMinutes: number;
	reportedBy: string | null;
	reportedAt: Date;
	followUpById: string | null;
	followUpBy: string | null;
	closed: boolean;
	events: { kind: IncidentEventKind; at: Date; by: string | null; note: string }[];
}

/**
 * A venue's incidents, for one night or for several, open first and then in the order they
 * happened; optionally only those a person follows up, or only open ones.
 */
export async function listIncidents(
	db: Db,
	venueId: string,
	opts: { showIds: string[]; followUpBy?: string; openOnly?: boolean }
): Promise<IncidentView[]> {
	if (!opts.showIds.length) return [];
	const rows = await db
		.select({ incident: incidents, date: shows.date, roomName: rooms.name })
		.from(incidents)
		.innerJoin(shows, eq(shows.id, incidents.showId))
		.leftJoin(rooms, eq(rooms.id, incidents.roomId))
		.where(
			and(
				eq(incidents.venueId, venueId),
				anyUuid(incidents.showId, opts.showIds),
				opts.followUpBy ? eq(incidents.followUpBy, opts.followUpBy) : undefined
			)
		)
		.orderBy(asc(incidents.happenedAt), asc(incidents.reportedAt));
	if (!rows.length) return [];
	const ids = rows.map((r) => r.incident.id);
	const people = [
		...new Set(
			rows.flatMap((r) => [r.incident.personId, r.incident.followUpBy]).filter((x) => x !== null)
		)
	] as string[];
	const [events, names] = await Promise.all([
		db
			.select({ event: incidentEvents, by: users.name, email: users.email })
			.from(incidentEvents)
			.leftJoin(users, eq(users.id, incidentEvents.personId))
			.where(and(eq(incidentEvents.venueId, venueId), anyUuid(incidentEvents.incidentId, ids)))
			.orderBy(asc(incidentEvents.at)),
		people.length
			? db
					.select({ id: users.id, name: users.name, email: users.email })
					.from(users)
					.where(anyText(users.id, people))
			: []
	]);
	const nameOf = new Map(names.map((p) => [p.id, p.name ?? p.email]));
	const views: IncidentView[] = rows.map(({ incident: i, date, roomName }) => {
		const mine = events.filter((e) => e.event.incidentId === i.id);
		return {
			id: i.id,
			showId: i.showId,
			showDate: date,
			kind: i.kind,
			happenedAt: i.happenedAt,
			roomName,
			whatHappened: i.whatHappened,
			whatWasDone: i.whatWasDone,
			firstAid: i.firstAid,
			firstAidGiven: i.firstAidGiven,
			stoppedMinutes: i.stoppedMinutes,
			reportedBy: i.personId ? (nameOf.get(i.personId) ?? null) : null,
			reportedAt: i.reportedAt,
			followUpById: i.followUpBy,
			followUpBy: i.followUpBy ? (nameOf.get(i.followUpBy) ?? null) : null,
			closed: mine.some((e) => e.event.kind === 'closed'),
			events: mine.map(({ event: e, by, email }) => ({
				kind: e.kind,
				at: e.at,
				by: by ?? email,
				note: e.note
			}))
		};
	});
	const sorted = [...views.filter((v) => !v.closed), ...views.filter((v) => v.closed)];
	return opts.openOnly ? sorted.filter((v) => !v.closed) : sorted;
}

/** How many of a night's incidents are still open. */
export async function openIncidentCount(db: Db, venueId: string, showId: string) {
	return (await incidentCounts(db, venueId, [showId])).get(showId)?.open ?? 0;
}

/** The ids of a season's nights, in date order. */
export async function seasonShowIds(db: Db, venueId: string, seasonId: string) {
	const rows = await db
		.select({ id: shows.id })
		.from(shows)
		.where(and(eq(shows.venueId, venueId), eq(shows.seasonId, seasonId)))
		.orderBy(asc(shows.date));
	return rows.map((r) => r.id);
}

/** Each night's incidents and how many are open, for the nights that have any. */
export async function incidentCounts(db: Db, venueId: string, showIds: string[]) {
	const out = new Map<string, { total: number; open: number }>();
	if (!showIds.length) return out;
	const rows = await db
		.select({
			showId: incidents.showId,
			total: sql<number>`count(*)::int`,
			// Written out in full: Drizzle leaves column names unqualified in a one-table select,
			// which would tie the inner table to itself.
			open: sql<number>`(count(*) filter (where not exists (
				select 1 from incident_events e
				where e.incident_id = "incidents"."id" and e.kind = 'closed'
			)))::int`
		})
		.from(incidents)
		.where(and(eq(incidents.venueId, venueId), anyUuid(incidents.showId, showIds)))
		.groupBy(incidents.showId);
	for (const r of rows) out.set(r.showId, { total: r.total, open: r.open });
	return out;
}
