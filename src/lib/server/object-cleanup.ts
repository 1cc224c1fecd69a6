import type PgBoss from 'pg-boss';
import type { ObjectStore } from '$lib/server/objects';

/**
 * Deleting uploaded objects after their rows are gone. The database is the record: a removal has
 * already committed when this runs, so a store that is down must not undo it. Keys that could not
 * be deleted go to a pg-boss queue that retries with backoff (deleting a missing key succeeds, so
 * a retry is harmless); without the queue they are logged.
 */
export const OBJECT_CLEANUP_QUEUE = 'object-delete';

const retry = { retryLimit: 8, retryDelay: 30, retryBackoff: true as const };

let queue: { boss: PgBoss } | null = null;

export async function startObjectCleanup(boss: PgBoss, store: () => ObjectStore) {
	await boss.createQueue(OBJECT_CLEANUP_QUEUE, { name: OBJECT_CLEANUP_QUEUE, ...retry });
	await boss.work<{ keys: string[] }>(
		OBJECT_CLEANUP_QUEUE,
		{ batchSize: 5, pollingIntervalSeconds: 10 },
		async (jobs) => {
			for (const job of jobs) {
				const failed = await tryRemove(store(), job.data.keys);
				if (failed.length) {
					await boss
						.fail(OBJECT_CLEANUP_QUEUE, job.id, { reason: `${failed.length} objects not deleted` })
						.catch(() => {});
				}
			}
		}
	);
	queue = { boss };
}

export function stopObjectCleanup() {
	queue = null;
}

async function tryRemove(store: ObjectStore, keys: string[]) {
	const failed: string[] = [];
	for (const key of keys) {
		try {
			await store.remove(key);
		} catch (e) {
			console.error(`[object cleanup] ${key}:`, e instanceof Error ? e.message : e);
			failed.push(key);
		}
	}
	return failed;
}

/**
 * Delete these objects now; whatever fails is queued for later. Never throws. Returns the keys
 * that are still in the store after this call (queued or only logged).
 */
export async function discardObjects(store: ObjectStore, keys: string[]): Promise<string[]> {
	if (!keys.length) return [];
	const failed = await tryRemove(store, keys);
	if (failed.length) {
		if (queue) {
			await queue.boss
				.send(OBJECT_CLEANUP_QUEUE, { keys: failed }, retry)
				.catch((e: unknown) =>
					console.error('[object cleanup] could not queue a retry:', e, failed)
				);
		} else console.error('[object cleanup] left in the store:', failed.join(', '));
	}
	return failed;
}
