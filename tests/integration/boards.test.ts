import { afterAll, beforeAll, describe, expect, inject, it, vi } from 'vitest';
import { sql } from 'drizzle-orm';
import mqtt from 'mqtt';
import { controllers, props, sensors } from '../../src/lib/server/db/schema';
import { issueKey, revokeKey } from '../../src/lib/server/boards/keys';
import { resetLimits } from '../../src/lib/server/boards/limits';
import { runReadingsJob } from '../../src/lib/server/boards/rollup';
import { startBoardListener, type Listener } from '../../src/lib/server/boards/mqtt';
import type { Accepted } from '../../src/lib/server/boards/accept';
import { makePerson, makeVenue, testDb } from './db';
import { callHandler, useTestEnv } from './routes';

// Board keys and readings, through the HTTP route and through the real broker.
vi.mock('$env/dynamic/private', () => ({ env: process.env }));
useTestEnv();
const db = testDb();
const { POST } = await import('../../src/routes/api/boards/readings/+server');

const controllerValues = {
	supplyV: 5,
	clockHz: 16e6,
	timerBits: 16,
	pwmBits: 8,
	referenceV: 1.1,
	pinLimitMa: 20,
	supplyRatingA: 2
};

async function board(venueId: string, name: string, sensorName: string) {
	const [c] = await db
		.insert(controllers)
		.values({ ...controllerValues, venueId, name })
		.returning();
	const [p] = await db
		.insert(props)
		.values({ venueId, name: `${name} prop`, controllerId: c.id })
		.returning();
	const [s] = await db
		.insert(sensors)
		.values({
			venueId,
			propId: p.id,
			name: sensorName,
			kind: 'button',
			settings: { kind: 'button' } as never
		})
		.returning();
	return { controller: c, sensor: s };
}

let here: Awaited<ReturnType<typeof board>>;
let other: Awaited<ReturnType<typeof board>>;
let elsewhere: Awaited<ReturnType<typeof board>>;
let token: string;
let personId: string;

const count = async (sensorId: string) =>
	(
		(await db.execute(
			sql`select count(*)::int as n from readings where sensor_id = ${sensorId}`
		)) as unknown as { n: number }[]
	)[0].n;

const send = (body: string, key: string | null = token, type = 'application/json') =>
	callHandler(POST as never, {
		path: '/api/boards/readings',
		params: {},
		person: null,
		method: 'POST',
		body,
		routeId: '/api/boards/readings',
		headers: { 'content-type': type, ...(key ? { authorization: `Bearer ${key}` } : {}) }
	});

beforeAll(async () => {
	const person = await makePerson(db, 'Rosalind Quill');
	personId = person.id;
	const { venue } = await makeVenue(db, [[person.id, 'designer']]);
	const { venue: v2 } = await makeVenue(db);
	here = await board(venue.id, 'Well board', 'Lid button');
	other = await board(venue.id, 'Gate board', 'Gate plate');
	elsewhere = await board(v2.id, 'Far board', 'Far plate');
	token = (await issueKey(db, venue.id, here.controller.id, person.id))!.token;
	resetLimits();
});

describe('readings over HTTPS', () => {
	it('stores a good batch once, by short name, and skips a replay', async () => {
		const body = JSON.stringify({
			readings: [
				{ sensor: 'lid-button', seq: 1, reading: 510 },
				{ sensor: 'Lid button', seq: 2, reading: 512, label: 'idle' },
				{ sensor: here.sensor.id, seq: 2, reading: 512 }
			]
		});
		const first = await send(body);
		expect(first).toMatchObject({ status: 200, body: { stored: 2, duplicates: 1 } });
		const again = await send(body);
		expect(again).toMatchObject({ status: 200, body: { stored: 0, duplicates: 3 } });
		const lines = await send('lid-button 3 515 hand\nlid-button 2 512\n', token, 'text/x-lines');
		expect(lines).toMatchObject({ status: 200, body: { stored: 1, duplicates: 1 } });
		expect(await count(here.sensor.id)).toBe(3);
		const [label] = (await db.execute(
			sql`select label from readings where sensor_id = ${here.sensor.id} and seq = 3`
		)) as unknown as { label: string }[];
		expect(label.label).toBe('hand');
	});

	it('refuses another controller’s sensor, another venue’s sensor and bad keys, storing nothing', async () => {
		const before = await count(here.sensor.id);
		const mixed = JSON.stringify([
			{ sensor: 'lid-button', seq: 50, reading: 1 },
			{ sensor: other.sensor.id, seq: 50, reading: 1 }
		]);
		const r1 = await send(mixed);
		expect(r1.status).toBe(422);
		expect(String(r1.body?.message)).toContain('Nothing was stored');
		const r2 = await send(JSON.stringify([{ sensor: elsewhere.sensor.id, seq: 1, reading: 1 }]));
		expect(r2.status).toBe(422);
		expect(
			await send(JSON.stringify([{ sensor: 'lid-button', seq: 51, reading: 1 }]), null)
		).toMatchObject({ status: 401 });
		expect(
			await send(JSON.stringify([{ sensor: 'lid-button', seq: 51, reading: 1 }]), 'glb_nonsense')
		).toMatchObject({ status: 401 });
		expect(await count(here.sensor.id)).toBe(before);
		expect(await count(other.sensor.id)).toBe(0);
		expect(await count(elsewhere.sensor.id)).toBe(0);
	});

	it('answers malformed and oversized payloads with a 4xx in words', async () => {
		const before = await count(here.sensor.id);
		const bad: [string, number, RegExp][] = [
			['{"readings": [', 400, /not valid JSON/],
			['{"readings": []}', 400, /no readings/],
			['[{"sensor":"lid-button","seq":-1,"reading":1}]', 400, /sequence number/],
			['[{"sensor":"lid-button","seq":1.5,"reading":1}]', 400, /sequence number/],
			['[{"sensor":"lid-button","seq":60,"reading":"loud"}]', 400, /must be a number/],
			['[{"sensor":"lid-button","seq":60,"reading":1,"label":"a\\u0000b"}]', 400, /label/],
			['lid-button 60', 400, /sensor seq reading/],
			['x'.repeat(70_000), 413, /at most 64 KB/]
		];
		for (const [body, status, words] of bad) {
			const a = await send(
				body,
				token,
				body.startsWith('[') || body.startsWith('{') ? 'application/json' : 'text/x-lines'
			);
			expect(a.status, body.slice(0, 40)).toBe(status);
			expect(String(a.body?.message)).toMatch(words);
		}
		expect(await count(here.sensor.id)).toBe(before);
	});

	it('limits a key to its rate', async () => {
		resetLimits();
		const batch = (from: number) =>
			JSON.stringify(
				Array.from({ length: 1000 }, (_, i) => ({
					sensor: 'lid-button',
					seq: from + i,
					reading: i
				}))
			);
		expect((await send(batch(1000))).status).toBe(200);
		expect((await send(batch(2000))).status).toBe(200);
		const third = await send(batch(3000));
		expect(third.status).toBe(429);
		expect(String(third.body?.message)).toMatch(/faster than allowed/);
		resetLimits();
	});

	it('refuses a revoked key', async () => {
		const made = (await issueKey(db, here.controller.venueId, here.controller.id, personId))!;
		expect(
			(await send('[{"sensor":"lid-button","seq":9000,"reading":1}]', made.token)).status
		).toBe(200);
		await revokeKey(db, here.controller.venueId, made.id);
		const before = await count(here.sensor.id);
		const r = await send('[{"sensor":"lid-button","seq":9001,"reading":1}]', made.token);
		expect(r.status).toBe(401);
		expect(await count(here.sensor.id)).toBe(before);
	});
});

describe('readings through the broker', () => {
	let listener: Listener;
	const results: { topic: string; result: Accepted }[] = [];
	const logged: string[] = [];
	let waiting: (() => void) | null = null;
	beforeAll(async () => {
		listener = await startBoardListener(db, inject('mqttUrl'), {
			log: (l) => logged.push(l),
			onResult: (topic, result) => {
				results.push({ topic, result });
				waiting?.();
			}
		});
	});
	afterAll(() => listener.stop());

	async function publish(topic: string, payload: string) {
		const n = results.length;
		const done = new Promise<void>((res) => {
			waiting = () => results.length > n && res();
		});
		const board = await mqtt.connectAsync(inject('mqttUrl'));
		await board.publishAsync(topic, payload, { qos: 1 });
		await board.endAsync();
		await done;
		return results[results.length - 1].result;
	}

	it('stores a message with a good key once, and logs refusals', async () => {
		const topic = `gloaming/${here.controller.id}/readings`;
		const msg = `key ${token}\nlid-button 20001 600\nlid-button 20002 601 hand`;
		expect(await publish(topic, msg)).toMatchObject({ ok: true, stored: 2 });
		expect(await publish(topic, msg)).toMatchObject({ ok: true, stored: 0, duplicates: 2 });
		const wrongTopic = await publish(`gloaming/${other.controller.id}/readings`, msg);
		expect(wrongTopic).toMatchObject({ ok: false, status: 403 });
		const noKey = await publish(topic, 'lid-button 20003 600');
		expect(noKey).toMatchObject({ ok: false, status: 401 });
		const junk = await publish(topic, JSON.stringify({ key: token, readings: 'many' }));
		expect(junk).toMatchObject({ ok: false, status: 400 });
		const foreign = await publish(
			topic,
			JSON.stringify({
				key: token,
				readings: [{ sensor: elsewhere.sensor.id, seq: 1, reading: 1 }]
			})
		);
		expect(foreign).toMatchObject({ ok: false, status: 422 });
		expect(logged.filter((l) => l.includes('refused'))).toHaveLength(4);
		const [n] = (await db.execute(
			sql`select count(*)::int as n from readings where sensor_id = ${here.sensor.id} and seq between 20001 and 20003`
		)) as unknown as { n: number }[];
		expect(n.n).toBe(2);
	});
});

describe('the readings job', () => {
	it('rolls minutes up and drops partitions past the retention', async () => {
		const { storeReadings } = await import('../../src/lib/server/boards/ingest');
		const key = { id: 'job', venueId: here.controller.venueId, controllerId: here.controller.id };
		// Ten days ago, one minute: 2, 4, 4, 4, 5, 5, 7, 9. Reference: the worked example in
		// Wikipedia's "Standard deviation" article: mean 5, population σ 2, so the sample
		// σ = 2·√(8/7) = 2.13809.
		const old = new Date(Date.UTC(2026, 10, 23, 21, 14, 5));
		await db.execute(sql`select readings_add_partitions('2026-11-22'::date, 3)`);
		const values = [2, 4, 4, 4, 5, 5, 7, 9];
		const stored = await storeReadings(
			db,
			key,
			values.map((v, i) => ({ sensor: 'lid-button', seq: 500_000 + i, reading: v, label: null })),
			old
		);
		expect(stored).toMatchObject({ ok: true, stored: 8 });
		const now = new Date(Date.UTC(2026, 11, 3, 12, 0, 0));
		const result = await runReadingsJob(db, { retentionDays: 7, now });
		expect(result.partitionsDropped).toContain('readings_20261123');
		expect(result.partitionsDropped).not.toContain('readings_20261203');
		const [m] = (await db.execute(
			sql`select count, mean, sigma, min, max, last_seq from reading_minutes
				where sensor_id = ${here.sensor.id} and minute = '2026-11-23T21:14:00Z'`
		)) as unknown as {
			count: number;
			mean: number;
			sigma: number;
			min: number;
			max: number;
			last_seq: string;
		}[];
		expect(m.count).toBe(8);
		expect(m.mean).toBeCloseTo(5, 10);
		expect(m.sigma).toBeCloseTo(2.13809, 5);
		expect([m.min, m.max, Number(m.last_seq)]).toEqual([2, 9, 500_007]);
		const [left] = (await db.execute(
			sql`select to_regclass('readings_20261123') is null as gone`
		)) as unknown as { gone: boolean }[];
		expect(left.gone).toBe(true);
		// Partitions made ahead, and a second run finds nothing more to drop.
		const again = await runReadingsJob(db, { retentionDays: 7, now });
		expect(again.partitionsDropped).toEqual([]);
		const [ahead] = (await db.execute(
			sql`select to_regclass('readings_20261209') is not null as made`
		)) as unknown as { made: boolean }[];
		expect(ahead.made).toBe(true);
	});
});
