import { afterAll, beforeAll, describe, expect, inject, it, vi } from 'vitest';
import { spawn } from 'node:child_process';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { sql } from 'drizzle-orm';
import { controllers, props, sensors } from '../../src/lib/server/db/schema';
import { issueKey, revokeKey } from '../../src/lib/server/boards/keys';
import { storeReadings } from '../../src/lib/server/boards/ingest';
import { resetLimits } from '../../src/lib/server/boards/limits';
import { quietBoards, UNHEARD_MINUTES } from '../../src/lib/server/boards/live';
import { startBoardListener, type Listener } from '../../src/lib/server/boards/mqtt';
import type { Role } from '../../src/lib/roles';
import { makePerson, makeVenue, testDb } from './db';
import { asSession, callHandler, useTestEnv } from './routes';

// What the boards said lately: the sensor's live endpoint, Tonight's list of quiet boards, and
// the board simulator publishing through the real broker into the real tables.
vi.mock('$env/dynamic/private', () => ({ env: process.env }));
useTestEnv();
const db = testDb();
const live =
	await import('../../src/routes/api/v/[venue]/props/[prop=uuid]/sensors/[sensor=uuid]/live/+server');
const tonight = await import('../../src/routes/(app)/v/[venue]/+page.server');
const header =
	await import('../../src/routes/(app)/v/[venue]/controllers/[controller=uuid]/firmware.h/+server');

const controllerValues = {
	supplyV: 5,
	clockHz: 16e6,
	timerBits: 16,
	pwmBits: 8,
	prescaler: 64,
	referenceV: 1.1,
	pinLimitMa: 20,
	supplyRatingA: 2
};

async function board(venueId: string, name: string) {
	const [c] = await db
		.insert(controllers)
		.values({ ...controllerValues, venueId, name })
		.returning();
	const [p] = await db
		.insert(props)
		.values({ venueId, name: `${name} prop`, controllerId: c.id })
		.returning();
	const [plate] = await db
		.insert(sensors)
		.values({
			venueId,
			propId: p.id,
			name: 'Lip plate',
			kind: 'capacitive',
			settings: {
				kind: 'capacitive',
				resistanceOhm: 1e6,
				plateAreaCm2: 150,
				gapMm: 15,
				strayPf: 12,
				samplesAveraged: 8,
				readingNoiseCounts: 2,
				handFraction: 0.5
			},
			near: 1560,
			far: 1490,
			hysteresis: 5,
			calibration: {
				direction: 'up',
				enter: 1495,
				exit: 1490,
				baselineLow: 1471,
				baselineHigh: 1489,
				captureId: null,
				appliedAt: '2026-10-01T18:00:00.000Z'
			}
		})
		.returning();
	const [beam] = await db
		.insert(sensors)
		.values({
			venueId,
			propId: p.id,
			name: 'Gate beam',
			kind: 'break_beam',
			settings: { kind: 'break_beam', beamLengthM: 1.5 }
		})
		.returning();
	return { controller: c, prop: p, plate, beam };
}

type Person = Awaited<ReturnType<typeof makePerson>>;
const people = {} as Record<Role | 'outsider', Person>;
let venue: Awaited<ReturnType<typeof makeVenue>>['venue'];
let here: Awaited<ReturnType<typeof board>>;

beforeAll(async () => {
	for (const r of ['owner', 'designer', 'show_manager', 'crew', 'outsider'] as const)
		people[r] = await makePerson(db, `Live ${r}`);
	({ venue } = await makeVenue(db, [
		[people.owner.id, 'owner'],
		[people.designer.id, 'designer'],
		[people.show_manager.id, 'show_manager'],
		[people.crew.id, 'crew']
	]));
	await makeVenue(db, [[people.outsider.id, 'owner']]);
	here = await board(venue.id, 'Well board');
	resetLimits();
});

const askLive = (who: Person, ids = { prop: here.prop.id, sensor: here.plate.id }, after = '') =>
	callHandler(live.GET as never, {
		path: `/api/v/${venue.slug}/props/${ids.prop}/sensors/${ids.sensor}/live${after ? `?after=${after}` : ''}`,
		params: { venue: venue.slug, ...ids },
		person: asSession(who),
		routeId: '/api/v/[venue]/props/[prop=uuid]/sensors/[sensor=uuid]/live'
	});

describe('the live readings endpoint', () => {
	it('gives designers, owners and show managers the last seconds and when the board was heard', async () => {
		const key = { id: 'live-test', venueId: venue.id, controllerId: here.controller.id };
		const now = Date.now();
		// Three readings in one second two seconds ago, one in the second before.
		const at = (ms: number) => new Date(Math.floor((now - ms) / 1000) * 1000 + 100);
		await storeReadings(
			db,
			key,
			[{ sensor: 'lip-plate', seq: 1, reading: 1480, label: null }],
			at(3000)
		);
		for (const [i, v] of [1478, 1482, 1486].entries())
			await storeReadings(
				db,
				key,
				[{ sensor: 'lip-plate', seq: 10 + i, reading: v, label: null }],
				at(2000)
			);
		for (const who of [people.designer, people.owner, people.show_manager]) {
			const r = await askLive(who);
			expect(r.status).toBe(200);
			const points = r.body!.points as [number, number][];
			expect(points.slice(-2).map(([, v]) => v)).toEqual([1480, 1482]);
			expect(points[points.length - 1][0] - points[points.length - 2][0]).toBe(1000);
			expect(r.body!.latest).toMatchObject({ reading: 1486 });
			expect(Math.abs((r.body!.heardAt as number) - at(2000).getTime())).toBeLessThan(1000);
		}
		// Asking after the last point gives nothing twice.
		const first = await askLive(people.designer);
		const next = await askLive(people.designer, undefined, String(first.body!.through));
		expect((next.body!.points as unknown[]).length).toBe(0);
	});

	it('refuses crew, another venue and another prop’s sensor, and a bad time', async () => {
		expect((await askLive(people.crew)).status).toBe(403);
		expect((await askLive(people.outsider)).status).toBe(404);
		const other = await board(venue.id, 'Gate board');
		const mixed = await askLive(people.designer, { prop: other.prop.id, sensor: here.plate.id });
		expect(mixed.status).toBe(404);
		const bad = await askLive(people.designer, undefined, 'soon');
		expect(bad.status).toBe(400);
		expect(String(bad.body!.message)).toContain('milliseconds');
	});
});

describe('the firmware header download', () => {
	it('carries the controller’s own sensors and thresholds, and no key', async () => {
		await issueKey(db, venue.id, here.controller.id, people.designer.id);
		const r = await callHandler(header.GET as never, {
			path: `/v/${venue.slug}/controllers/${here.controller.id}/firmware.h`,
			params: { venue: venue.slug, controller: here.controller.id },
			person: asSession(people.designer),
			routeId: '/(app)/v/[venue]/controllers/[controller=uuid]/firmware.h'
		});
		expect(r.status).toBe(200);
		const text = String(r.body!.text);
		expect(text).toContain('#define GLOAMING_LIP_PLATE_ENTER 1495.0');
		expect(text).toContain('#define GLOAMING_GATE_BEAM_NAME "gate-beam"');
		expect(text).toContain(`"gloaming/${here.controller.id}/readings"`);
		expect(text).not.toMatch(/glb_/);
	});
});

describe('Tonight’s quiet boards', () => {
	it('lists boards with a key in force that have gone quiet, not those without a key or heard lately', async () => {
		const { venue: v } = await makeVenue(db, [[people.designer.id, 'designer']]);
		const loud = await board(v.id, 'Loud board');
		const quiet = await board(v.id, 'Quiet board');
		const never = await board(v.id, 'Never board');
		await board(v.id, 'Keyless board');
		const revoked = await board(v.id, 'Revoked board');
		const keys = {
			loud: (await issueKey(db, v.id, loud.controller.id, people.designer.id))!,
			quiet: (await issueKey(db, v.id, quiet.controller.id, people.designer.id))!,
			never: (await issueKey(db, v.id, never.controller.id, people.designer.id))!,
			revoked: (await issueKey(db, v.id, revoked.controller.id, people.designer.id))!
		};
		await revokeKey(db, v.id, keys.revoked.id);
		const now = new Date();
		const put = (b: typeof loud, keyId: string, minutesAgo: number) =>
			storeReadings(
				db,
				{ id: keyId, venueId: v.id, controllerId: b.controller.id },
				[{ sensor: 'gate-beam', seq: 1, reading: 0, label: null }],
				new Date(now.getTime() - minutesAgo * 60_000)
			);
		await put(loud, keys.loud.id, 1);
		await put(quiet, keys.quiet.id, UNHEARD_MINUTES + 5);

		const list = await quietBoards(db, v.id, { now });
		expect(list.map((b) => b.name)).toEqual(['Never board', 'Quiet board']);
		expect(list[0].lastAt).toBeNull();
		expect(
			Math.abs(list[1].lastAt!.getTime() - (now.getTime() - (UNHEARD_MINUTES + 5) * 60_000))
		).toBeLessThan(1000);

		const page = await callHandler(tonight.load as never, {
			path: `/v/${v.slug}`,
			params: { venue: v.slug },
			person: asSession(people.designer),
			routeId: '/(app)/v/[venue]'
		});
		expect(page.status).toBe(200);
		const shown = (
			page.body!.quietBoards as { boards: { name: string; lastHeard: string | null }[] }
		).boards;
		expect(shown.map((b) => b.name)).toEqual(['Never board', 'Quiet board']);
		expect(shown[0].lastHeard).toBeNull();
		expect(shown[1].lastHeard).toMatch(/\d{1,2}:\d{2}/);
	});
});

describe('the board simulator', () => {
	let listener: Listener;
	afterAll(() => listener?.stop());

	it('makes a key once, and its readings arrive through the real broker', async () => {
		listener = await startBoardListener(db, inject('mqttUrl'), { log: () => {} });
		const { venue: v } = await makeVenue(db);
		const sim = await board(v.id, 'Simulated board');
		const keysFile = join(mkdtempSync(join(tmpdir(), 'simulator-')), 'keys.json');
		const run = () =>
			new Promise<string>((resolve, reject) => {
				const child = spawn(
					process.execPath,
					[
						'scripts/board-simulator.mjs',
						'--venue',
						v.slug,
						'--seconds',
						'3.5',
						'--keys',
						keysFile
					],
					{
						env: {
							...process.env,
							DATABASE_URL: inject('databaseUrl'),
							MQTT_URL: inject('mqttUrl')
						},
						stdio: ['ignore', 'pipe', 'pipe']
					}
				);
				let out = '';
				child.stdout.on('data', (c) => (out += c));
				child.stderr.on('data', (c) => (out += c));
				child.on('exit', (code) => (code === 0 ? resolve(out) : reject(new Error(out))));
			});
		const out = await run();
		expect(out).toContain('made a board key for Simulated board');
		expect(out).toMatch(/playing 1 board/);
		// Messages in flight when it stopped are still being stored: give them a moment.
		await new Promise((r) => setTimeout(r, 1000));
		const counts = async () =>
			(await db.execute(sql`
				select s.name, count(r.*)::int as n, avg(r.value) as mean, min(r.value) as lo, max(r.value) as hi
				from sensors s left join readings r on r.sensor_id = s.id
				where s.prop_id = ${sim.prop.id} group by s.name order by s.name`)) as unknown as {
				name: string;
				n: number;
				mean: number;
				lo: number;
				hi: number;
			}[];
		const [beam, plate] = await counts();
		// Ten readings a second for each sensor, sent once a second: about 3 seconds' worth.
		expect(plate.n).toBeGreaterThanOrEqual(20);
		expect(beam.n).toBe(plate.n);
		// Idle plate readings sit around the middle of the calibrated baseline band, 1471..1489.
		expect(plate.lo).toBeGreaterThan(1440);
		expect(plate.hi).toBeLessThan(1600);
		expect([0, 1]).toContain(beam.lo);
		const [keys] = (await db.execute(
			sql`select count(*)::int as n from board_keys where controller_id = ${sim.controller.id}`
		)) as unknown as { n: number }[];
		expect(keys.n).toBe(1);

		// A second run reuses the key it made.
		const again = await run();
		expect(again).not.toContain('made a board key');
		const [keys2] = (await db.execute(
			sql`select count(*)::int as n from board_keys where controller_id = ${sim.controller.id}`
		)) as unknown as { n: number }[];
		expect(keys2.n).toBe(1);
	}, 30_000);
});
