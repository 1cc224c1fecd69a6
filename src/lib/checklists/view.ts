import type { CheckExpected, CheckKind } from './generate';
import type { Outcome } from './evaluate';

export interface ResultView {
	id: string;
	checkId: string;
	outcome: Outcome;
	idleReading: number | null;
	presentReading: number | null;
	note: string | null;
	photoUrl: string | null;
	personName: string;
	/** When the phone recorded it. */
	recordedAt: string;
	/** When the server stored it. */
	receivedAt: string;
	/** The phone's clock looked wrong: ordered by the received time instead. */
	clockSuspect: boolean;
	/** Sent well after it was recorded (it waited on the phone). */
	late: boolean;
	/** Arrived after sign-off: a late correction, not part of what was signed. */
	afterSignOff: boolean;
	/** The readings were taken from the sensor's board, not typed. */
	fromBoard: boolean;
	/** When the board sent the present reading. */
	boardReadAt: string | null;
}

export interface CheckView {
	id: string;
	key: string;
	kind: CheckKind;
	propId: string | null;
	roomId: string | null;
	roomName: string;
	label: string;
	detail: string;
	required: boolean;
	expected: CheckExpected;
	latest: ResultView | null;
	/** Its prop is stood down for the night: excused from sign-off. */
	stoodDown: boolean;
}

export interface StandDownView {
	id: string;
	propId: string;
	propName: string;
	reason: string;
	personName: string;
	at: string;
}

export interface SignOffView {
	personName: string;
	at: string;
	note: string | null;
	/** Crew problems acknowledged with the sign-off. */
	acknowledged: { key: string; message: string }[];
}

export interface ChecklistView {
	showId: string;
	checks: CheckView[];
	/** Every result of the night, newest first (by recorded time, or received when the clock looked wrong). */
	history: (ResultView & { label: string })[];
	/** Results that arrived after sign-off, newest first. */
	corrections: (ResultView & { label: string })[];
	/** Stand-downs in force tonight. */
	standDowns: StandDownView[];
	/** Stand-downs a show manager undid, with both reasons. */
	restored: (StandDownView & { restoreReason: string; restoredBy: string; restoredAt: string })[];
	signOff: SignOffView | null;
}

export type CheckState = 'pass' | 'fail' | 'open' | 'stood_down';

export const NO_ROOM = 'Whole venue';

export function stateOf(check: Pick<CheckView, 'latest' | 'stoodDown'>): CheckState {
	if (check.latest?.outcome === 'pass') return 'pass';
	if (check.stoodDown) return 'stood_down';
	return check.latest ? 'fail' : 'open';
}

export interface RoomProgress {
	roomId: string | null;
	roomName: string;
	total: number;
	pass: number;
	fail: number;
	open: number;
	stood_down: number;
}

/** Counts per room, rooms in checklist order. */
export function progressByRoom(checks: CheckView[]): RoomProgress[] {
	const rooms = new Map<string, RoomProgress>();
	for (const c of checks) {
		const k = c.roomId ?? '';
		let r = rooms.get(k);
		if (!r) {
			r = {
				roomId: c.roomId,
				roomName: c.roomName,
				total: 0,
				pass: 0,
				fail: 0,
				open: 0,
				stood_down: 0
			};
			rooms.set(k, r);
		}
		r.total++;
		r[stateOf(c)]++;
	}
	return [...rooms.values()];
}

/**
 * What stands between the night and its sign-off: every required check must have passed, or
 * belong to a prop stood down for the night. Empty when the show manager may sign.
 */
export function signOffBlockers(checks: CheckView[]): string[] {
	const out: string[] = [];
	for (const c of checks) {
		if (!c.required) continue;
		const s = stateOf(c);
		if (s === 'fail') out.push(`Failed: ${c.label}`);
		else if (s === 'open') out.push(`Not recorded: ${c.label}`);
	}
	return out.sort((a, b) => (a.startsWith('Failed') ? 0 : 1) - (b.startsWith('Failed') ? 0 : 1));
}

/** The hazards the safety caution names, from the keys of the night's safety checks. */
export function hazardsOf(checks: Pick<CheckView, 'key'>[]): string[] {
	const keys = checks.map((c) => c.key);
	const out: string[] = [];
	if (keys.some((k) => k.startsWith('safety:pinch-guards'))) out.push('pneumatics');
	if (keys.some((k) => k.startsWith('safety:fog-'))) out.push('fog');
	if (keys.some((k) => k.startsWith('safety:strobe-signage'))) out.push('strobes');
	return out;
}
