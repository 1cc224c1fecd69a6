import { error } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { showAccess } from '$lib/server/checklists/access';
import { currentChecklist } from '$lib/server/checklists/copies';
import { bandText, enterText } from '$lib/checklists/evaluate';
import { stateOf, type ChecklistView } from '$lib/checklists/view';
import type { Clock } from '$lib/util/when';
import { localTime } from '$lib/util/when';
import type { PageServerLoad } from './$types';

const WORDS = { pass: 'passed', fail: 'FAILED', open: '', stood_down: 'stood down' } as const;

interface PrintLine {
	id: string;
	label: string;
	/** What to look for, or null. */
	detail: string | null;
	passed: boolean;
	/** The result so far in words, or the blanks to fill in. */
	result: string;
}
interface PrintRoom {
	id: string;
	name: string;
	checks: PrintLine[];
}

/** The sheet's lines by room, in words: worked out once per kept copy of the checklist. */
const sheets = new WeakMap<ChecklistView, { key: string; rooms: PrintRoom[] }>();

function sheetOf(view: ChecklistView, timeZone: string, clock: Clock): PrintRoom[] {
	const key = `${timeZone}|${clock}`;
	const kept = sheets.get(view);
	if (kept?.key === key) return kept.rooms;
	const rooms: PrintRoom[] = [];
	const byId = new Map<string, PrintRoom>();
	for (const c of view.checks) {
		const id = c.roomId ?? 'venue';
		let r = byId.get(id);
		if (!r) {
			r = { id, name: c.roomName, checks: [] };
			byId.set(id, r);
			rooms.push(r);
		}
		const s = stateOf(c);
		const reading = c.expected.mode === 'reading';
		let result: string;
		if (c.latest) {
			const readings =
				c.latest.idleReading !== null
					? ` (${c.latest.idleReading} / ${c.latest.presentReading})`
					: '';
			result = `${WORDS[s]}${readings}, ${c.latest.personName}, ${localTime(c.latest.recordedAt, timeZone, clock)}`;
		} else result = reading ? 'idle ______ present ______' : 'pass / fail';
		r.checks.push({
			id: c.id,
			label: c.label,
			detail:
				c.expected.mode === 'reading'
					? `Idle in ${bandText(c.expected.band)}; present ${enterText(c.expected.band)}`
					: c.expected.mode === 'walk'
						? 'Walk test: fires / does not fire'
						: null,
			passed: s === 'pass',
			result
		});
	}
	sheets.set(view, { key, rooms });
	return rooms;
}

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event);
	const access = await showAccess(db, venue, event.locals.person!.id, event.params.show);
	if (!access.ok) error(access.status, access.message);
	const s = access.show;
	// The server's kept copy of the checklist, as the crew page and the checks API read it; the
	// page gets only the words it prints, not the whole checklist.
	const copy = await currentChecklist(db, venue, s.id);
	return {
		show: {
			id: s.id,
			date: s.date,
			crewCall: localTime(s.crewCall, venue.timeZone, venue.clock),
			doorsOpen: localTime(s.doorsOpen, venue.timeZone, venue.clock)
		},
		rooms: sheetOf(copy.view, venue.timeZone, venue.clock)
	};
};
