import { sql } from 'drizzle-orm';
import type postgres from 'postgres';
import type { Db } from '$lib/server/db/client';

/** One PostgreSQL channel for every show; the payload is the show's id. */
export const CHANNEL = 'gloaming_checklists';

/** Tell every app server that a show's checklist changed (results, stand-downs, sign-off). */
export async function notifyShow(db: Pick<Db, 'execute'>, showId: string) {
	await db.execute(sql`select pg_notify(${CHANNEL}, ${showId})`);
}

/**
 * Fans PostgreSQL notifications out to the browsers watching each show. One LISTEN per app server,
 * opened on the first subscriber; postgres.js re-listens by itself after a dropped connection.
 */
export function createLiveHub(client: postgres.Sql) {
	const watchers = new Map<string, Set<() => void>>();
	let listening: Promise<unknown> | null = null;
	const listen = () =>
		(listening ??= client
			.listen(CHANNEL, (showId) => {
				for (const fn of watchers.get(showId) ?? []) fn();
			})
			.catch((e) => {
				listening = null;
				throw e;
			}));
	return {
		async subscribe(showId: string, fn: () => void): Promise<() => void> {
			await listen();
			let set = watchers.get(showId);
			if (!set) watchers.set(showId, (set = new Set()));
			set.add(fn);
			return () => {
				set.delete(fn);
				if (set.size === 0) watchers.delete(showId);
			};
		},
		watching(showId: string): number {
			return watchers.get(showId)?.size ?? 0;
		}
	};
}
export type LiveHub = ReturnType<typeof createLiveHub>;

/**
 * A Server-Sent Events stream for one show: an event 'changed' after each change, a comment every
 * 20 s to keep proxies from closing it, and an unsubscribe as soon as the browser goes away.
 */
export function showEventStream(hub: LiveHub, showId: string, signal?: AbortSignal) {
	const enc = new TextEncoder();
	let stop: (() => void) | null = null;
	return new ReadableStream<Uint8Array>({
		async start(controller) {
			let closed = false;
			const send = (text: string) => {
				if (closed) return;
				try {
					controller.enqueue(enc.encode(text));
				} catch {
					stop?.();
				}
			};
			const unsubscribe = await hub.subscribe(showId, () =>
				send(`event: changed\ndata: ${JSON.stringify({ at: new Date().toISOString() })}\n\n`)
			);
			const beat = setInterval(() => send(': still here\n\n'), 20_000);
			stop = () => {
				if (closed) return;
				closed = true;
				clearInterval(beat);
				unsubscribe();
				try {
					controller.close();
				} catch {
					// already closed by the reader
				}
			};
			if (signal?.aborted) return stop();
			signal?.addEventListener('abort', () => stop?.());
			send('retry: 3000\n: listening\n\n');
		},
		cancel() {
			stop?.();
		}
	});
}
