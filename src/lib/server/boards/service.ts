import type { Db } from '$lib/server/db/client';
import { startBoardListener, type Listener } from './mqtt';
import { runReadingsJob } from './rollup';

// At start-up: the MQTT subscription (when a broker is configured) and the readings job every
// five minutes. A broker that is down is retried by the client; the app starts regardless.

const EVERY_MS = 5 * 60_000;

export async function startBoards(db: Db, mqttUrl: string | null, retentionDays: number) {
	let listener: Listener | null = null;
	if (mqttUrl) {
		try {
			listener = await startBoardListener(db, mqttUrl);
			console.log(`[boards] listening on ${mqttUrl}`);
		} catch (e) {
			console.error(
				`[boards] could not reach the broker at ${mqttUrl}: ${e instanceof Error ? e.message : e}`
			);
		}
	}
	const run = () =>
		runReadingsJob(db, { retentionDays }).catch((e: unknown) =>
			console.error(`[boards] readings job failed: ${e instanceof Error ? e.message : e}`)
		);
	void run();
	const timer = setInterval(run, EVERY_MS);
	timer.unref();
	return {
		async stop() {
			clearInterval(timer);
			await listener?.stop().catch(() => {});
		}
	};
}
