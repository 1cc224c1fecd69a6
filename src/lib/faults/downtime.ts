// Faults on props: the words for severities and events, a fault's state from its events, and
// downtime from report to verified repair. Pure: shared by the server and the browser.

export const FAULT_SEVERITIES = ['stops_scene', 'degraded', 'cosmetic'] as const;
export type FaultSeverity = (typeof FAULT_SEVERITIES)[number];
export const SEVERITY_WORDS: Record<FaultSeverity, string> = {
	stops_scene: 'Stops the scene',
	degraded: 'Degraded',
	cosmetic: 'Cosmetic'
};

export const FAULT_EVENT_KINDS = ['reported', 'repaired', 'retested', 'closed'] as const;
export type FaultEventKind = (typeof FAULT_EVENT_KINDS)[number];

export interface FaultEventLike {
	kind: FaultEventKind;
	at: Date;
	passed?: boolean | null;
}

export type FaultState = 'open' | 'repaired' | 'verified' | 'closed';

/**
 * Where a fault stands: open until a repair; repaired until a passing re-test after the latest
 * repair; verified (ready to close) after one; closed once closed. A failing re-test sends it
 * back to open, waiting for another repair.
 */
export function faultState(events: FaultEventLike[]): FaultState {
	let state: FaultState = 'open';
	for (const e of [...events].sort((a, b) => a.at.getTime() - b.at.getTime())) {
		if (e.kind === 'closed') return 'closed';
		if (e.kind === 'repaired') state = 'repaired';
		if (e.kind === 'retested' && state === 'repaired') state = e.passed ? 'verified' : 'open';
	}
	return state;
}

/** The passing re-test that verified the repair, if there is one. */
export function verifiedAt(events: FaultEventLike[]): Date | null {
	let repaired = false;
	let verified: Date | null = null;
	for (const e of [...events].sort((a, b) => a.at.getTime() - b.at.getTime())) {
		if (e.kind === 'repaired') {
			repaired = true;
			verified = null;
		}
		if (e.kind === 'retested' && repaired) {
			verified = e.passed ? e.at : null;
			if (!e.passed) repaired = false;
		}
	}
	return verified;
}

/** Whole minutes a prop was down: from the report to the verified repair, or to `now` while open. */
export function downtimeMinutes(reportedAt: Date, endedAt: Date | null, now: Date): number {
	const end = endedAt ?? now;
	return Math.max(0, Math.round((end.getTime() - reportedAt.getTime()) / 60_000));
}

/** Minutes in words: "45 min", "2 h 15 min", "3 h", "1 d 4 h" (minutes dropped past a day). */
export function durationWords(minutes: number): string {
	const m = Math.max(0, Math.round(minutes));
	if (m < 60) return `${m} min`;
	const days = Math.floor(m / 1440);
	const hours = Math.floor((m % 1440) / 60);
	const rest = m % 60;
	if (days) return hours ? `${days} d ${hours} h` : `${days} d`;
	return rest ? `${hours} h ${rest} min` : `${hours} h`;
}
