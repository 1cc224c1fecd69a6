import type PgBoss from 'pg-boss';
import type { Db } from '$lib/server/db/client';
import { sweepRunSheets } from './send';

export const RUN_SHEET_SWEEP = 'run-sheet-sweep';

/**
 * Once a minute (a pg-boss schedule: one job per minute across all app servers), queue the run
 * sheets that are due and the change notices that are owed. The dedupe keys make a doubled run
 * harmless.
 */
export async function startRunSheetSweep(boss: PgBoss, db: Db, origin: string) {
	await boss.createQueue(RUN_SHEET_SWEEP, { name: RUN_SHEET_SWEEP, retryLimit: 0 });
	await boss.work(RUN_SHEET_SWEEP, { pollingIntervalSeconds: 5 }, async () => {
		try {
			await sweepRunSheets(db, new Date(), origin);
		} catch (e) {
			console.error('[run sheets]', e instanceof Error ? e.message : e);
		}
	});
	await boss.schedule(RUN_SHEET_SWEEP, '* * * * *');
}
