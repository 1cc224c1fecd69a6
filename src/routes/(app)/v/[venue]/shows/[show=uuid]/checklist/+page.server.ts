import { error } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { showAccess } from '$lib/server/checklists/access';
import { currentChecklist } from '$lib/server/checklists/copies';
import { hazardsOf } from '$lib/checklists/view';
import { baselineAlerts } from '$lib/server/boards/baselines';
import type { PageServerLoad } from './$types';

/**
 * Past this many checks the page arrives with only the checks it shows first (the person's rooms,
 * or the first rooms up to this many) and every room's counts; the rest come from the checks API
 * right after, which is also the copy a phone keeps for use without signal.
 */
const FIRST_CHECKS = 150;

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event);
	const access = await showAccess(db, venue, event.locals.person!.id, event.params.show);
	if (!access.ok) error(access.status, access.message);
	const [copy, alerts] = await Promise.all([
		currentChecklist(db, venue, access.show.id),
		baselineAlerts(db, venue.id, access.show)
	]);
	const view = copy.view;
	// The rooms of the person's posts tonight; none (every room) for a safety post or no room post.
	const posts = access.posts;
	const own = [
		...new Map(posts.flatMap((p) => (p.roomId && p.room ? [[p.roomId, p.room] as const] : [])))
	].map(([id, name]) => ({ id, name }));
	const myRooms = own.length && !posts.some((p) => p.safetyPost) ? own : null;
	const partial = view.checks.length > FIRST_CHECKS;
	let checks = view.checks;
	if (partial && myRooms) {
		const mine = new Set(myRooms.map((r) => r.id));
		checks = checks.filter((c) => c.roomId !== null && mine.has(c.roomId));
	} else if (partial) {
		// Whole rooms, in checklist order, until the first FIRST_CHECKS are in.
		const first = new Set<string | null>();
		let n = 0;
		for (const r of copy.progress) {
			if (n >= FIRST_CHECKS) break;
			first.add(r.roomId);
			n += r.total;
		}
		checks = checks.filter((c) => first.has(c.roomId));
	}
	return {
		myRooms,
		show: { id: access.show.id, date: access.show.date, status: access.show.status },
		checklist: partial ? { ...view, checks, history: [], corrections: [] } : view,
		/** Only some checks came with the page: every room's counts stand in until the rest arrive. */
		partial,
		roomCounts: partial ? copy.progress : [],
		counts: copy.counts,
		hazards: hazardsOf(view.checks),
		manages: access.manages,
		/** By check key: tonight's idle baseline is outside its band or heading there. */
		baselineNotes: Object.fromEntries(alerts.map((a) => [`sensor:${a.sensorId}`, a.words]))
	};
};
