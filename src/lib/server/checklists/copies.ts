import type { ChecklistView, CheckState, RoomProgress } from '$lib/checklists/view';
import { progressByRoom, signOffBlockers, stateOf } from '$lib/checklists/view';
import type { Db } from '$lib/server/db/client';
import { loadChecklist } from './state';
import { checklistStale, ensureChecklist, freshness } from './sync';

/** A show's checklist as read at one stamp, with what every page works out from it. */
export interface ChecklistCopy {
	view: ChecklistView;
	progress: RoomProgress[];
	blockers: string[];
	counts: Record<CheckState, number> & { total: number };
	/** The API's answer, serialised once per copy. */
	json(): string;
}

/** Shows kept per app server; the least recently read goes first. */
export const MAX_COPIES = 16;
/** People's names in a copy may lag a rename by this much; everything else is exact. */
export const COPY_MAX_AGE_MS = 30_000;

type Kept = { stamp: string; at: number; copy: ChecklistCopy };
const kept = new Map<string, Kept>();
const building = new Map<string, Promise<ChecklistCopy>>();

function copyOf(view: ChecklistView): ChecklistCopy {
	const progress = progressByRoom(view.checks);
	const blockers = signOffBlockers(view.checks);
	const counts = { total: view.checks.length, pass: 0, fail: 0, open: 0, stood_down: 0 };
	for (const c of view.checks) counts[stateOf(c)]++;
	let json: string | null = null;
	return {
		view,
		progress,
		blockers,
		counts,
		json: () => (json ??= JSON.stringify({ ...view, progress, blockers }))
	};
}

/**
 * A show's checklist, fresh: one read of the show's numbers (its checklist's inputs, the activity
 * counter its checks, results, stand-downs, restores and sign-off raise, and whether it is signed)
 * and, when they match the copy this server read last, that copy. Otherwise the checklist is
 * regenerated if stale and read once, however many requests ask for it at the same moment.
 */
export async function currentChecklist(
	db: Db,
	venue: { id: string; slug: string },
	showId: string,
	now = Date.now()
): Promise<ChecklistCopy> {
	let [row] = await freshness(db, venue.id, showId);
	if (row && checklistStale(row)) {
		await ensureChecklist(db, venue.id, showId);
		[row] = await freshness(db, venue.id, showId);
	}
	if (!row) return copyOf(await loadChecklist(db, venue, showId));
	const key = `${venue.id}:${venue.slug}:${showId}`;
	const stamp = `${row.checklistVersion}:${row.inputsVersion}:${row.activity}:${row.signed}`;
	const hit = kept.get(key);
	if (hit && hit.stamp === stamp && now - hit.at < COPY_MAX_AGE_MS) {
		kept.delete(key);
		kept.set(key, hit);
		return hit.copy;
	}
	const job = `${key}|${stamp}`;
	let pending = building.get(job);
	if (!pending) {
		// Read after the stamp: a write in between makes the copy newer than its stamp, never older.
		pending = loadChecklist(db, venue, showId).then(copyOf);
		building.set(job, pending);
		void pending
			.then((copy) => {
				kept.delete(key);
				kept.set(key, { stamp, at: now, copy });
				while (kept.size > MAX_COPIES) kept.delete(kept.keys().next().value!);
			})
			.catch(() => {})
			.finally(() => building.delete(job));
	}
	return pending;
}

/** Forget every copy (tests). */
export function forgetCopies() {
	kept.clear();
}
