import { error } from '@sveltejs/kit';
import { and, eq } from 'drizzle-orm';
import { requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { seasons } from '$lib/server/db/schema';
import { seasonReport } from '$lib/server/reports/season';
import { durationWords } from '$lib/faults/downtime';
import { figure, formatQuantity } from '$lib/quantity';
import { localDay } from '$lib/util/when';
import { INCIDENT_KIND_LABELS } from '$lib/schemas/incident-words';
import type { PageServerLoad } from './$types';

/** A share 0..1 as a percentage on screen: "97.5 %", or a dash when there is nothing to share. */
const percent = (share: number | null) =>
	share === null ? '—' : formatQuantity(share * 100, 'percent', { digits: 3 });
const minutes = (m: number | null) => (m === null ? '—' : durationWords(m));

/** The season report: for owners, show managers and designers (crew see their own nights). */
export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event, 'owner', 'show_manager', 'designer');
	const [season] = await db
		.select({ id: seasons.id, name: seasons.name, darkNights: seasons.darkNights })
		.from(seasons)
		.where(and(eq(seasons.id, event.params.season), eq(seasons.venueId, venue.id)));
	if (!season) error(404, 'There is no such season in this venue.');
	const r = await seasonReport(db, venue.id, season);
	const propRow = (p: (typeof r.props)[number]) => ({
		id: p.propId,
		name: p.name,
		roomName: p.roomName ?? '—',
		share: p.uptime,
		uptime: percent(p.uptime),
		down: durationWords(p.downMinutes),
		downMinutes: Math.round(p.downMinutes),
		failures: p.failures,
		mtbf: minutes(p.mtbf),
		mttr: minutes(p.mttr)
	});
	return {
		season: { id: season.id, name: season.name },
		totals: r.totals,
		hasRun: r.showMinutes > 0,
		// Show time in hours: durationWords drops the hours past a day.
		showTime:
			r.showMinutes < 60 ? durationWords(r.showMinutes) : `${figure(r.showMinutes / 60, 4)} h`,
		venueFigures: {
			uptime: percent(r.venue.uptime),
			failures: r.venue.failures,
			repaired: r.venue.repaired,
			mtbf: minutes(r.venue.mtbf),
			mttr: minutes(r.venue.mttr),
			down: durationWords(r.venue.downMinutes)
		},
		nights: r.nights.map((n) => ({
			id: n.id,
			day: localDay(n.date),
			status: n.status,
			begun: n.begun,
			signedOff: n.signedOff,
			guests: n.guests
		})),
		props: r.props.map(propRow),
		mostDown: r.mostDown.map(propRow),
		faultsByProp: r.faultsByProp.map((f) => ({
			id: f.propId,
			name: f.name,
			roomName: f.roomName ?? '—',
			...f.counts
		})),
		faultsByRoom: r.faultsByRoom.map((f) => ({
			id: f.roomId ?? 'none',
			name: f.name ?? 'No room given',
			...f.counts
		})),
		incidentsByKind: r.incidentsByKind.map((i) => ({
			kind: i.kind,
			label: INCIDENT_KIND_LABELS[i.kind],
			count: i.count,
			stopped: i.stoppedMinutes ? durationWords(i.stoppedMinutes) : '—'
		}))
	};
};
