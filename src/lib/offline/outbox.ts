// Check results recorded on a phone wait here until the server has them. They live in IndexedDB,
// so they outlast a closed tab and a restarted phone; each carries an id made on the phone, so a
// result (or its photo) sent twice is stored once. Nothing is dropped: a result the server refuses
// stays, marked, until the person tries again or removes it.

import { openDB, type DBSchema, type IDBPDatabase } from 'idb';

export interface WaitingPhoto {
	/** Made on the phone; the upload sends it so a repeated upload is stored once. */
	clientId: string;
	blob: Blob;
	name: string;
	/** The server's id once the upload has gone. */
	photoId: string | null;
}

export type OutboxState = 'waiting' | 'refused' | 'sent';

export interface OutboxItem {
	/** Order of recording on this phone. */
	seq?: number;
	clientId: string;
	/** Who recorded it: only their own session sends it. */
	personId: string;
	venueSlug: string;
	showId: string;
	checkId: string;
	label: string;
	outcome?: 'pass' | 'fail';
	idleReading?: number | null;
	presentReading?: number | null;
	/** Both readings came from the board as taken; with the time the board sent the present one. */
	fromBoard?: boolean;
	boardReadAt?: string | null;
	note: string | null;
	photo: WaitingPhoto | null;
	/** When the phone recorded it (ISO 8601). */
	recordedAt: string;
	/** The outcome the phone expects, shown while it waits. */
	expect: 'pass' | 'fail';
	state: OutboxState;
	/** Why the server refused it, in its words. */
	message: string | null;
	sentAt: string | null;
}

/** How one attempt to send went. */
export type SendAnswer =
	| { kind: 'stored' }
	| { kind: 'photo-stored'; photoId: string }
	| { kind: 'refused'; message: string }
	/** Try again later, keeping the order: no connection, the server busy or failing. */
	| { kind: 'later'; why: 'offline' | 'server' }
	| { kind: 'signed-out' };

/** What to make of an answer from the server. 4xx other than these are the result's own fault. */
export function judgeStatus(status: number): 'ok' | 'later' | 'signed-out' | 'refused' {
	if (status >= 200 && status < 300) return 'ok';
	if (status === 401) return 'signed-out';
	// Timed out, rate-limited, or the server's fault: the result itself is fine.
	if (status === 408 || status === 425 || status === 429 || status >= 500) return 'later';
	return 'refused';
}

/** The storage the outbox needs; IndexedDB in the browser, a plain list in tests. */
export interface OutboxStore {
	all(): Promise<OutboxItem[]>;
	add(item: OutboxItem): Promise<void>;
	put(item: OutboxItem): Promise<void>;
	remove(clientId: string): Promise<void>;
}

export interface Transport {
	uploadPhoto(item: OutboxItem, photo: WaitingPhoto): Promise<SendAnswer>;
	sendResult(item: OutboxItem): Promise<SendAnswer>;
}

export interface DrainReport {
	sent: number;
	refused: number;
	/** Why sending stopped before the end, if it did. */
	stopped: 'offline' | 'server' | 'signed-out' | null;
}

/**
 * Send the person's waiting results, oldest first. A refusal marks that result and goes on with
 * the next; no connection, a failing server or an ended session stops, keeping the rest in order.
 */
export async function drain(
	store: OutboxStore,
	transport: Transport,
	personId: string,
	now: () => Date = () => new Date()
): Promise<DrainReport> {
	const report: DrainReport = { sent: 0, refused: 0, stopped: null };
	const waiting = (await store.all())
		.filter((i) => i.personId === personId && i.state === 'waiting')
		.sort((a, b) => (a.seq ?? 0) - (b.seq ?? 0));
	for (const item of waiting) {
		let answer: SendAnswer | null = null;
		if (item.photo && !item.photo.photoId) {
			const upload = await transport.uploadPhoto(item, item.photo);
			if (upload.kind === 'photo-stored') {
				item.photo = { ...item.photo, photoId: upload.photoId };
				await store.put(item);
			} else if (upload.kind === 'refused') {
				answer = { kind: 'refused', message: `The photo was refused: ${upload.message}` };
			} else answer = upload;
		}
		answer ??= await transport.sendResult(item);
		if (answer.kind === 'later' || answer.kind === 'signed-out') {
			report.stopped = answer.kind === 'later' ? answer.why : 'signed-out';
			break;
		}
		if (answer.kind === 'refused') {
			await store.put({ ...item, state: 'refused', message: answer.message });
			report.refused++;
		} else {
			// A photo of a result already sent is not kept on the phone.
			await store.put({
				...item,
				state: 'sent',
				photo: null,
				message: null,
				sentAt: now().toISOString()
			});
			report.sent++;
		}
	}
	return report;
}

/** Sent results are shown for a while, then forgotten; waiting and refused ones are kept. */
export async function forgetOldSent(store: OutboxStore, now: Date, keepMs: number) {
	for (const item of await store.all()) {
		if (item.state === 'sent' && item.sentAt && now.getTime() - Date.parse(item.sentAt) > keepMs)
			await store.remove(item.clientId);
	}
}

/** The JSON body of a result, as the checks API takes it. */
export function resultBody(item: OutboxItem) {
	return {
		clientId: item.clientId,
		checkId: item.checkId,
		outcome: item.outcome,
		idleReading: item.idleReading ?? null,
		presentReading: item.presentReading ?? null,
		fromBoard: item.fromBoard ?? false,
		boardReadAt: item.boardReadAt ?? null,
		note: item.note,
		photoId: item.photo?.photoId ?? null,
		recordedAt: item.recordedAt
	};
}

async function messageOf(res: Response, fallback: string): Promise<string> {
	const body = (await res.json().catch(() => null)) as { message?: unknown } | null;
	return typeof body?.message === 'string' ? body.message : fallback;
}

async function answerOf(
	res: Response,
	fallback: string,
	ok: (res: Response) => Promise<SendAnswer>
): Promise<SendAnswer> {
	const judged = judgeStatus(res.status);
	if (judged === 'ok') return ok(res);
	if (judged === 'later') return { kind: 'later', why: 'server' };
	if (judged === 'signed-out') return { kind: 'signed-out' };
	return { kind: 'refused', message: await messageOf(res, fallback) };
}

/** Sends with the page's fetch to the checks API. */
export function httpTransport(fetcher: typeof fetch = fetch): Transport {
	const api = (i: OutboxItem) => `/api/v/${i.venueSlug}/shows/${i.showId}`;
	return {
		async uploadPhoto(item, photo) {
			let res: Response;
			try {
				const q = new URLSearchParams({ filename: photo.name, clientId: photo.clientId });
				res = await fetcher(`${api(item)}/photos?${q}`, { method: 'POST', body: photo.blob });
			} catch {
				return { kind: 'later', why: 'offline' };
			}
			return answerOf(res, 'the server would not take it.', async (r) => {
				const body = (await r.json().catch(() => null)) as { photoId?: unknown } | null;
				return typeof body?.photoId === 'string'
					? { kind: 'photo-stored', photoId: body.photoId }
					: { kind: 'later', why: 'server' };
			});
		},
		async sendResult(item) {
			let res: Response;
			try {
				res = await fetcher(`${api(item)}/results`, {
					method: 'POST',
					headers: { 'content-type': 'application/json' },
					body: JSON.stringify(resultBody(item))
				});
			} catch {
				return { kind: 'later', why: 'offline' };
			}
			return answerOf(res, 'The result was refused.', async () => ({ kind: 'stored' }));
		}
	};
}

interface OutboxDb extends DBSchema {
	results: {
		key: number;
		value: OutboxItem;
		indexes: { clientId: string };
	};
}

let opened: Promise<IDBPDatabase<OutboxDb>> | null = null;

function database() {
	opened ??= openDB<OutboxDb>('gloaming', 1, {
		upgrade(db) {
			const results = db.createObjectStore('results', { keyPath: 'seq', autoIncrement: true });
			results.createIndex('clientId', 'clientId', { unique: true });
		}
	});
	return opened;
}

const CHANNEL = 'gloaming-outbox';
let sender: BroadcastChannel | null = null;
const listeners = new Set<() => void>();

/** Tell this tab and the others that the outbox changed. */
function changed() {
	if (typeof BroadcastChannel === 'undefined') {
		for (const fn of listeners) fn();
		return;
	}
	sender ??= new BroadcastChannel(CHANNEL);
	sender.postMessage('changed');
}

/** Call onChange whenever the outbox changes, here or in another tab; returns a function that stops. */
export function watchOutbox(onChange: () => void): () => void {
	if (typeof BroadcastChannel === 'undefined') {
		listeners.add(onChange);
		return () => listeners.delete(onChange);
	}
	const c = new BroadcastChannel(CHANNEL);
	c.onmessage = () => onChange();
	return () => c.close();
}

/** The outbox in this browser's IndexedDB. */
export const browserStore: OutboxStore = {
	async all() {
		return (await database()).getAll('results');
	},
	async add(item) {
		const { seq: _seq, ...rest } = item;
		await (await database()).add('results', rest as OutboxItem);
		changed();
	},
	async put(item) {
		const db = await database();
		const tx = db.transaction('results', 'readwrite');
		const seq = await tx.store.index('clientId').getKey(item.clientId);
		if (seq !== undefined) await tx.store.put({ ...item, seq });
		await tx.done;
		changed();
	},
	async remove(clientId) {
		const db = await database();
		const tx = db.transaction('results', 'readwrite');
		const seq = await tx.store.index('clientId').getKey(clientId);
		if (seq !== undefined) await tx.store.delete(seq);
		await tx.done;
		changed();
	}
};

/** Record a result on this phone; it waits here until the server has it. */
export async function keepResult(item: Omit<OutboxItem, 'state' | 'message' | 'sentAt'>) {
	await browserStore.add({ ...item, state: 'waiting', message: null, sentAt: null });
}

/** A refused result, sent again as it is, or without its photo. */
export async function tryAgain(item: OutboxItem, withoutPhoto = false) {
	await browserStore.put({
		...item,
		state: 'waiting',
		message: null,
		photo: withoutPhoto ? null : item.photo
	});
}

/** The person chose to let a refused result go. */
export async function letGo(item: OutboxItem) {
	await browserStore.remove(item.clientId);
}

/** Everything the person recorded on this phone, oldest first. */
export async function outboxOf(personId: string): Promise<OutboxItem[]> {
	return (await browserStore.all())
		.filter((i) => i.personId === personId)
		.sort((a, b) => (a.seq ?? 0) - (b.seq ?? 0));
}

/**
 * Send what waits, one tab at a time (a Web Lock where the browser has them; the ids make a
 * second sending harmless where it has not).
 */
export async function sendWaiting(personId: string): Promise<DrainReport> {
	const run = async () => {
		await forgetOldSent(browserStore, new Date(), 36 * 3_600_000);
		return drain(browserStore, httpTransport(), personId);
	};
	if (typeof navigator !== 'undefined' && navigator.locks)
		return navigator.locks.request('gloaming-outbox', run);
	return run();
}
