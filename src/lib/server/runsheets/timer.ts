import type PgBoss from 'pg-boss';
import type { Db } from '$lib/server/db/client';
import { refreshUpcomingChecklists } from '$lib/server/checklists/sync';
import { sweepRunSheets } from './send';

export const RUN_SHEET_SWEEP = 'run-sheet-sweep';

/**
 * Once a minute (a pg-boss schedule: one job per minute across all app servers), bring the
 * checklists of the next day and a half up to date, then queue the run sheets that are due and
 * the change notices that are owed. The dedupe keys make a doubled run harmless.
 */
export async function startRunSheetSweep(boss: PgBoss, db: Db, origin: string) {
	await boss.createQueue(RUN_SHEET_SWEEP, { name: RUN_SHEET_SWEEP, retryLimit: 0 });
	await boss.work(RUN_SHEET_SWEEP, { pollingIntervalSeconds: 5 }, async () => {
		try {
			const now = new Date();
			await refreshUpcomingChecklists(db, now);
			await sweepRunSheets(db, now, origin);
		} catch (e) {
			console.error('[run sheets]', e instanceof Error ? e.message : e);
		}
	});
	await boss.schedule(RUN_SHEET_SWEEP, '* * * * *');
}
