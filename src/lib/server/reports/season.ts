// The season report's figures: nights, guests, uptime per prop and for the venue, faults by prop
// and by room, incidents by kind. A fixed number of statements whatever the size of the season
// (grouped in SQL, no query per prop or per night); the maths is src/lib/reports/uptime.ts.
import { and, asc, eq, inArray, lte, or, gte, sql } from 'drizzle-orm';
import type { Db } from '$lib/server/db/client';
import {
	faultEvents,
	faults,
	guestCounts,
	incidents,
	props,
	rooms,
	shows,
	signOffs,
	standDowns
} from '$lib/server/db/schema';
import { faultState, verifiedAt, type FaultSeverity } from '$lib/faults/downtime';
import { mostDowntime, seasonUptime, type PropUptime } from '$lib/reports/uptime';
import { notRestored } from '$lib/server/scenes/for-show';
import type { IncidentKind } from '$lib/schemas/incident-words';

type Reader = Pick<Db, 'select' | 'selectDistinctOn'>;
const DAY = 86_400_000;
const IN_SERVICE = new Set(['installed', 'show_ready', 'stood_down']);

export interface SeasonReport {
	nights: {
		id: string;
		date: string;
		status: 'scheduled' | 'cancelled' | 'dark';
		begun: boolean;
		signedOff: boolean;
		guests: number | null;
	}[];
	totals: {
		scheduled: number;
		run: number;
		signedOff: number;
		dark: number;
		cancelled: number;
		guests: number;
		counted: number;
	};
	showMinutes: number;
	venue: Omit<PropUptime, 'propId'>;
	props: (PropUptime & { name: string; roomName: string | null })[];
	mostDown: (PropUptime & { name: string; roomName: string | null })[];
	faultsByProp: { propId: string; name: string; roomName: string | null; counts: SeverityCounts }[];
	faultsByRoom: { roomId: string | null; name: string | null; counts: SeverityCounts }[];
	incidentsByKind: { kind: IncidentKind; count: number; stoppedMinutes: number }[];
}
export type SeverityCounts = Record<FaultSeverity, number> & { total: number };

const noCounts = (): SeverityCounts => ({ stops_scene: 0, degraded: 0, cosmetic: 0, total: 0 });

export async function seasonReport(
	db: Reader,
	venueId: string,
	season: { id: string; darkNights: string[] },
	now = new Date()
): Promise<SeasonReport> {
	const seasonId = season.id;
	const seasonShowIds = db
		.select({ id: shows.id })
		.from(shows)
		.where(and(eq(shows.venueId, venueId), eq(shows.seasonId, seasonId)));
	const [nightRows, counts, propRows, downs, incidentRows] = await Promise.all([
		db
			.select({
				id: shows.id,
				date: shows.date,
				status: shows.status,
				doorsOpen: shows.doorsOpen,
				doorsClose: shows.doorsClose,
				signedOff: sql<boolean>`(${signOffs.id} is not null)`
			})
			.from(shows)
			.leftJoin(signOffs, eq(signOffs.showId, shows.id))
			.where(and(eq(shows.venueId, venueId), eq(shows.seasonId, seasonId)))
			.orderBy(asc(shows.date)),
		// The latest count of each night.
		db
			.selectDistinctOn([guestCounts.showId], {
				showId: guestCounts.showId,
				guests: guestCounts.guests
			})
			.from(guestCounts)
			.where(and(eq(guestCounts.venueId, venueId), inArray(guestCounts.showId, seasonShowIds)))
			.orderBy(guestCounts.showId, sql`${guestCounts.at} desc`, sql`${guestCounts.id} desc`),
		db
			.select({ id: props.id, name: props.name, status: props.status, roomName: rooms.name })
			.from(props)
			.leftJoin(rooms, eq(rooms.id, props.roomId))
			.where(eq(props.venueId, venueId))
			.orderBy(asc(props.name)),
		db
			.select({ propId: standDowns.propId, showId: standDowns.showId })
			.from(standDowns)
			.where(
				and(
					eq(standDowns.venueId, venueId),
					inArray(standDowns.showId, seasonShowIds),
					notRestored()
				)
			),
		db
			.select({
				kind: incidents.kind,
				count: sql<number>`count(*)::int`,
				stoppedMinutes: sql<number>`coalesce(sum(${incidents.stoppedMinutes}), 0)::int`
			})
			.from(incidents)
			.where(and(eq(incidents.venueId, venueId), inArray(incidents.showId, seasonShowIds)))
			.groupBy(incidents.kind)
	]);

	const scheduled = nightRows.filter((n) => n.status === 'scheduled');
	const begun = (n: { doorsOpen: Date }) => n.doorsOpen.getTime() < now.getTime();
	const run = scheduled.filter(begun);
	const guestsOf = new Map(counts.map((c) => [c.showId, c.guests]));

	// Faults that matter to the season: any reported on its nights (a day either side, for the
	// pre-show and close-of-night reports), and earlier "stops the scene" ones still down then.
	const from = scheduled.length ? new Date(scheduled[0].doorsOpen.getTime() - DAY) : now;
	const to = new Date(
		(run.length ? run[run.length - 1].doorsClose.getTime() : from.getTime()) + DAY
	);
	const faultRows = scheduled.length
		? await db
				.select({
					id: faults.id,
					propId: faults.propId,
					roomId: faults.roomId,
					roomName: rooms.name,
					severity: faults.severity,
					reportedAt: faults.reportedAt
				})
				.from(faults)
				.leftJoin(rooms, eq(rooms.id, faults.roomId))
				.where(
					and(
						eq(faults.venueId, venueId),
						lte(faults.reportedAt, to),
						or(gte(faults.reportedAt, from), eq(faults.severity, 'stops_scene'))
					)
				)
		: [];
	const stopping = faultRows.filter((f) => f.severity === 'stops_scene');
	const events = stopping.length
		? await db
				.select({
					faultId: faultEvents.faultId,
					kind: faultEvents.kind,
					at: faultEvents.at,
					passed: faultEvents.passed
				})
				.from(faultEvents)
				.where(
					and(
						eq(faultEvents.venueId, venueId),
						inArray(
							faultEvents.faultId,
							stopping.map((f) => f.id)
						)
					)
				)
				.orderBy(asc(faultEvents.at))
		: [];
	const eventsOf = new Map<string, typeof events>();
	for (const e of events) {
		const list = eventsOf.get(e.faultId);
		if (list) list.push(e);
		else eventsOf.set(e.faultId, [e]);
	}

	// The props in service (installed, show-ready, stood down), and any other that was down.
	const wasDown = new Set([...stopping.map((f) => f.propId), ...downs.map((d) => d.propId)]);
	const counted = propRows.filter((p) => IN_SERVICE.has(p.status) || wasDown.has(p.id));
	const uptime = seasonUptime({
		nights: scheduled,
		propIds: counted.map((p) => p.id),
		faults: stopping.map((f) => {
			const mine = eventsOf.get(f.id) ?? [];
			const state = faultState(mine);
			return {
				propId: f.propId,
				reportedAt: f.reportedAt,
				verifiedAt: state === 'verified' || state === 'closed' ? verifiedAt(mine) : null
			};
		}),
		standDowns: downs,
		now
	});
	const propOf = new Map(propRows.map((p) => [p.id, p]));
	const named = uptime.props.map((u) => ({
		...u,
		name: propOf.get(u.propId)!.name,
		roomName: propOf.get(u.propId)!.roomName
	}));

	// Faults by prop and by room: those reported on the season's nights only.
	const inSeason = faultRows.filter((f) => f.reportedAt >= from);
	const byProp = new Map<string, SeverityCounts>();
	const byRoom = new Map<string | null, { name: string | null; counts: SeverityCounts }>();
	for (const f of inSeason) {
		const p = byProp.get(f.propId) ?? noCounts();
		p[f.severity]++;
		p.total++;
		byProp.set(f.propId, p);
		const r = byRoom.get(f.roomId) ?? { name: f.roomName, counts: noCounts() };
		r.counts[f.severity]++;
		r.counts.total++;
		byRoom.set(f.roomId, r);
	}

	return {
		nights: nightRows.map((n) => ({
			id: n.id,
			date: n.date,
			status: n.status,
			begun: begun(n),
			signedOff: n.signedOff,
			guests: guestsOf.get(n.id) ?? null
		})),
		totals: {
			scheduled: scheduled.length,
			run: run.length,
			signedOff: nightRows.filter((n) => n.signedOff).length,
			// Nights marked dark, and the season's dark nights the rule leaves out (no show row).
			dark:
				nightRows.filter((n) => n.status === 'dark').length +
				season.darkNights.filter((d) => !nightRows.some((n) => n.date === d)).length,
			cancelled: nightRows.filter((n) => n.status === 'cancelled').length,
			guests: counts.reduce((s, c) => s + c.guests, 0),
			counted: counts.length
		},
		showMinutes: uptime.showMinutes,
		venue: uptime.venue,
		props: named,
		mostDown: mostDowntime(named),
		faultsByProp: [...byProp]
			.map(([propId, c]) => ({
				propId,
				name: propOf.get(propId)?.name ?? 'A removed prop',
				roomName: propOf.get(propId)?.roomName ?? null,
				counts: c
			}))
			.sort((a, b) => b.counts.total - a.counts.total || a.name.localeCompare(b.name)),
		faultsByRoom: [...byRoom]
			.map(([roomId, r]) => ({ roomId, ...r }))
			.sort((a, b) => b.counts.total - a.counts.total),
		incidentsByKind: incidentRows
			.map((r) => ({ kind: r.kind, count: r.count, stoppedMinutes: r.stoppedMinutes }))
			.sort((a, b) => b.count - a.count)
	};
}
