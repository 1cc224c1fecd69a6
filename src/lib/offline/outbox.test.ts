import { describe, expect, it } from 'vitest';
import {
	drain,
	forgetOldSent,
	judgeStatus,
	resultBody,
	type OutboxItem,
	type OutboxStore,
	type SendAnswer,
	type Transport
} from './outbox';

function memoryStore(items: OutboxItem[]): OutboxStore & { items: OutboxItem[] } {
	const store = {
		items,
		async all() {
			return store.items.map((i) => ({ ...i }));
		},
		async add(item: OutboxItem) {
			store.items.push({ ...item, seq: store.items.length + 1 });
		},
		async put(item: OutboxItem) {
			store.items = store.items.map((i) => (i.clientId === item.clientId ? { ...item } : i));
		},
		async remove(clientId: string) {
			store.items = store.items.filter((i) => i.clientId !== clientId);
		}
	};
	return store;
}

let n = 0;
function item(extra: Partial<OutboxItem> = {}): OutboxItem {
	n++;
	return {
		seq: n,
		clientId: `client-${n}`,
		personId: 'p1',
		venueSlug: 'trail',
		showId: 'show-1',
		checkId: `check-${n}`,
		label: `Check ${n}`,
		outcome: 'pass',
		note: null,
		photo: null,
		recordedAt: '2027-10-01T20:41:00.000Z',
		expect: 'pass',
		state: 'waiting',
		message: null,
		sentAt: null,
		...extra
	};
}

/** Answers from a script, one per call, and a log of what was sent. */
function scripted(results: SendAnswer[], photos: SendAnswer[] = []) {
	const log: string[] = [];
	const transport: Transport = {
		async uploadPhoto(i) {
			log.push(`photo ${i.clientId}`);
			return photos.shift() ?? { kind: 'photo-stored', photoId: 'photo-id' };
		},
		async sendResult(i) {
			log.push(`result ${i.clientId} photo=${i.photo?.photoId ?? 'none'}`);
			return results.shift() ?? { kind: 'stored' };
		}
	};
	return { transport, log };
}

const now = () => new Date('2027-10-01T22:56:00.000Z');

describe('sending the results waiting on a phone', () => {
	it('sends in the order they were recorded, and keeps them as sent', async () => {
		const a = item();
		const b = item();
		const c = item();
		// Stored out of order; seq is the order of recording.
		const store = memoryStore([c, a, b]);
		const { transport, log } = scripted([]);
		const report = await drain(store, transport, 'p1', now);
		expect(log).toEqual([a, b, c].map((i) => `result ${i.clientId} photo=none`));
		expect(report).toEqual({ sent: 3, refused: 0, stopped: null });
		expect(store.items.every((i) => i.state === 'sent' && i.sentAt === now().toISOString())).toBe(
			true
		);
		// The recorded time is what goes, never the time of sending.
		expect(resultBody(a).recordedAt).toBe('2027-10-01T20:41:00.000Z');
	});

	it('stops at no signal and keeps the rest waiting, in order, for next time', async () => {
		const a = item();
		const b = item();
		const c = item();
		const store = memoryStore([a, b, c]);
		const first = scripted([{ kind: 'stored' }, { kind: 'later', why: 'offline' }]);
		expect(await drain(store, first.transport, 'p1', now)).toEqual({
			sent: 1,
			refused: 0,
			stopped: 'offline'
		});
		expect(store.items.map((i) => i.state)).toEqual(['sent', 'waiting', 'waiting']);
		const second = scripted([]);
		await drain(store, second.transport, 'p1', now);
		expect(second.log).toEqual([b, c].map((i) => `result ${i.clientId} photo=none`));
	});

	it('keeps a refused result with the server’s words and goes on with the next', async () => {
		const a = item();
		const b = item();
		const store = memoryStore([a, b]);
		const { transport } = scripted([
			{ kind: 'refused', message: "That check is no longer on this night's list." }
		]);
		expect(await drain(store, transport, 'p1', now)).toEqual({
			sent: 1,
			refused: 1,
			stopped: null
		});
		expect(store.items[0]).toMatchObject({
			state: 'refused',
			message: "That check is no longer on this night's list."
		});
		expect(store.items[1].state).toBe('sent');
		// A refused result is not sent again by itself.
		const again = scripted([]);
		await drain(store, again.transport, 'p1', now);
		expect(again.log).toEqual([]);
	});

	it('stops, sending nothing more, when the session has ended', async () => {
		const store = memoryStore([item(), item()]);
		const { transport, log } = scripted([{ kind: 'signed-out' }]);
		expect((await drain(store, transport, 'p1', now)).stopped).toBe('signed-out');
		expect(log).toHaveLength(1);
		expect(store.items.map((i) => i.state)).toEqual(['waiting', 'waiting']);
	});

	it("sends only the signed-in person's results", async () => {
		const mine = item();
		const theirs = item({ personId: 'p2' });
		const store = memoryStore([theirs, mine]);
		const { transport, log } = scripted([]);
		await drain(store, transport, 'p1', now);
		expect(log).toEqual([`result ${mine.clientId} photo=none`]);
		expect(store.items.find((i) => i.clientId === theirs.clientId)!.state).toBe('waiting');
	});

	it('uploads the photo first and sends its id with the result; an upload that went is not repeated', async () => {
		const photo = { clientId: 'photo-client', blob: new Blob(['x']), name: 'a.png', photoId: null };
		const a = item({ photo });
		const store = memoryStore([a]);
		// The photo goes, then the connection drops before the result.
		const first = scripted(
			[{ kind: 'later', why: 'offline' }],
			[{ kind: 'photo-stored', photoId: 'server-photo' }]
		);
		await drain(store, first.transport, 'p1', now);
		expect(first.log).toEqual([`photo ${a.clientId}`, `result ${a.clientId} photo=server-photo`]);
		expect(store.items[0].photo!.photoId).toBe('server-photo');
		const second = scripted([]);
		await drain(store, second.transport, 'p1', now);
		expect(second.log).toEqual([`result ${a.clientId} photo=server-photo`]);
		// Once sent, the photo itself leaves the phone.
		expect(store.items[0]).toMatchObject({ state: 'sent', photo: null });
	});

	it('marks a result refused when its photo is refused, saying so', async () => {
		const photo = { clientId: 'p', blob: new Blob(['x']), name: 'a.gif', photoId: null };
		const store = memoryStore([item({ photo })]);
		const { transport, log } = scripted(
			[],
			[{ kind: 'refused', message: 'Take or choose a photo (PNG, JPEG or WebP).' }]
		);
		await drain(store, transport, 'p1', now);
		expect(log).toHaveLength(1);
		expect(store.items[0]).toMatchObject({
			state: 'refused',
			message: 'The photo was refused: Take or choose a photo (PNG, JPEG or WebP).'
		});
	});

	it('forgets sent results after a while, never waiting or refused ones', async () => {
		const old = '2027-09-29T20:00:00.000Z';
		const store = memoryStore([
			item({ state: 'sent', sentAt: old }),
			item({ state: 'sent', sentAt: '2027-10-01T22:00:00.000Z' }),
			item({ state: 'refused', message: 'no' }),
			item()
		]);
		await forgetOldSent(store, now(), 36 * 3_600_000);
		expect(store.items.map((i) => i.state)).toEqual(['sent', 'refused', 'waiting']);
	});
});

describe('what an answer from the server means', () => {
	it('tries again later on server trouble and rate limits, and refuses on the result’s own faults', () => {
		// RFC 9110 §15: 2xx success, 4xx the request's fault, 5xx the server's.
		expect(judgeStatus(201)).toBe('ok');
		expect(judgeStatus(200)).toBe('ok');
		expect(judgeStatus(401)).toBe('signed-out');
		for (const s of [408, 429, 500, 502, 503]) expect(judgeStatus(s)).toBe('later');
		for (const s of [400, 403, 404, 409, 413, 415]) expect(judgeStatus(s)).toBe('refused');
	});
});
