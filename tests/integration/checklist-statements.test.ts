import { describe, expect, it, vi } from 'vitest';
import { and, eq, isNull } from 'drizzle-orm';
import {
	assignments,
	checkResults,
	checks,
	outputs,
	positions,
	props,
	rooms,
	sceneCues,
	sceneResponses,
	scenes,
	sensors,
	shows
} from '../../src/lib/server/db/schema';
import { refreshUpcomingChecklists } from '../../src/lib/server/checklists/sync';
import { makePerson, makeVenue, testDb } from './db';
import { asSession, callHandler, useTestEnv } from './routes';

// Every statement the app's own database client sends, counted per request. The routes import
// `$lib/server/db`; here it is the same client with a statement listener.
const seen = vi.hoisted(() => ({ statements: [] as { query: string; params: number }[] }));
vi.mock('$env/dynamic/private', () => ({ env: process.env }));
vi.mock('$lib/server/db', async () => {
	const { createDb } = await import('../../src/lib/server/db/client');
	const client = createDb(process.env.DATABASE_URL!, {
		max: 10,
		onStatement: (query, params) => seen.statements.push({ query, params: params.length })
	});
	return { db: client.db, pg: client.sql, closeDb: () => client.sql.end() };
});
useTestEnv();
const db = testDb();
const checksApi = await import('../../src/routes/api/v/[venue]/shows/[show=uuid]/checks/+server');
const showPage = await import('../../src/routes/(app)/v/[venue]/shows/[show=uuid]/+page.server');
const crewPage =
	await import('../../src/routes/(app)/v/[venue]/shows/[show=uuid]/checklist/+page.server');
const tonight = await import('../../src/routes/(app)/v/[venue]/+page.server');
const printPage =
	await import('../../src/routes/(app)/v/[venue]/shows/[show=uuid]/checklist/print/+page.server');
const standDownPage =
	await import('../../src/routes/(app)/v/[venue]/shows/[show=uuid]/stand-down/+page.server');
const closePage =
	await import('../../src/routes/(app)/v/[venue]/shows/[show=uuid]/close/+page.server');

const led = {
	kind: 'led_string' as const,
	colour: 'white' as const,
	forwardV: 3.2,
	ledsInSeries: 3,
	strings: 1,
	currentMa: 20,
	supplyV: 12,
	switchDropV: 0.1,
	logicHighV: 5,
	gateThresholdMaxV: 2.5,
	continuousDrainMa: 200
};
const plate = {
	kind: 'capacitive' as const,
	resistanceOhm: 1e6,
	plateAreaCm2: 100,
	gapMm: 10,
	strayPf: 10,
	samplesAveraged: 4,
	readingNoiseCounts: 2,
	handFraction: 0.5
};

/** A venue whose next show runs `sceneCount` scenes, each using `propsPerScene` props. */
async function venueWith(sceneCount: number, propsPerScene: number) {
	const manager = await makePerson(db, 'Mara Lind');
	const crew = await makePerson(db, 'Tove Brink');
	const { venue } = await makeVenue(db, [
		[manager.id, 'show_manager'],
		[crew.id, 'crew']
	]);
	const [room] = await db
		.insert(rooms)
		.values({ venueId: venue.id, name: 'Cellar', position: 1 })
		.returning();
	const propRows = await db
		.insert(props)
		.values(
			Array.from({ length: sceneCount * propsPerScene }, (_, i) => ({
				venueId: venue.id,
				name: `Prop ${String(i).padStart(4, '0')}`,
				roomId: room.id
			}))
		)
		.returning();
	const sensorRows = await db
		.insert(sensors)
		.values(
			propRows.map((p) => ({
				venueId: venue.id,
				propId: p.id,
				kind: 'capacitive' as const,
				name: 'Plate',
				settings: plate
			}))
		)
		.returning();
	const outputRows = await db
		.insert(outputs)
		.values(
			propRows.map((p) => ({
				venueId: venue.id,
				propId: p.id,
				kind: 'led_string' as const,
				name: 'Glow',
				settings: led,
				safeState: 'full' as const
			}))
		)
		.returning();
	const sceneRows = await db
		.insert(scenes)
		.values(
			Array.from({ length: sceneCount }, (_, i) => ({
				venueId: venue.id,
				roomId: room.id,
				name: `Scene ${i}`,
				lengthMs: 5000
			}))
		)
		.returning();
	const outputOf = new Map(outputRows.map((o) => [o.propId, o]));
	const sensorOf = new Map(sensorRows.map((s) => [s.propId, s]));
	const uses = sceneRows.flatMap((s, i) =>
		propRows.slice(i * propsPerScene, (i + 1) * propsPerScene).map((p) => ({ s, p }))
	);
	await db.insert(sceneCues).values(
		uses.map(({ s, p }) => ({
			venueId: venue.id,
			sceneId: s.id,
			outputId: outputOf.get(p.id)!.id,
			startMs: 0,
			action: { type: 'set' as const, level: 0.5 }
		}))
	);
	await db.insert(sceneResponses).values(
		uses.map(({ s, p }) => ({
			venueId: venue.id,
			sceneId: s.id,
			sensorId: sensorOf.get(p.id)!.id,
			outputId: outputOf.get(p.id)!.id
		}))
	);
	const start = Date.now() + 3_600_000;
	const [show] = await db
		.insert(shows)
		.values({
			venueId: venue.id,
			date: new Date(start).toISOString().slice(0, 10),
			crewCall: new Date(start),
			doorsOpen: new Date(start + 3_600_000),
			doorsClose: new Date(start + 5 * 3_600_000)
		})
		.returning();
	const [post] = await db
		.insert(positions)
		.values({ venueId: venue.id, name: 'Room tech', required: true })
		.returning();
	await db
		.insert(assignments)
		.values({ venueId: venue.id, showId: show.id, positionId: post.id, personId: crew.id });
	return { venue, show, manager: asSession(manager), crew: asSession(crew), propRows };
}

type Setup = Awaited<ReturnType<typeof venueWith>>;

const requests = {
	'checks API': (v: Setup) =>
		callHandler(checksApi.GET as never, {
			path: `/api/v/${v.venue.slug}/shows/${v.show.id}/checks`,
			params: { venue: v.venue.slug, show: v.show.id },
			person: v.crew
		}),
	'show page': (v: Setup) =>
		callHandler(showPage.load as never, {
			path: `/v/${v.venue.slug}/shows/${v.show.id}`,
			params: { venue: v.venue.slug, show: v.show.id },
			person: v.manager
		}),
	'crew checklist': (v: Setup) =>
		callHandler(crewPage.load as never, {
			path: `/v/${v.venue.slug}/shows/${v.show.id}/checklist`,
			params: { venue: v.venue.slug, show: v.show.id },
			person: v.crew
		}),
	Tonight: (v: Setup) =>
		callHandler(tonight.load as never, {
			path: `/v/${v.venue.slug}`,
			params: { venue: v.venue.slug },
			person: v.manager
		}),
	'Tonight, crew': (v: Setup) =>
		callHandler(tonight.load as never, {
			path: `/v/${v.venue.slug}`,
			params: { venue: v.venue.slug },
			person: v.crew
		}),
	'print page': (v: Setup) =>
		callHandler(printPage.load as never, {
			path: `/v/${v.venue.slug}/shows/${v.show.id}/checklist/print`,
			params: { venue: v.venue.slug, show: v.show.id },
			person: v.crew
		}),
	'stand-down page': (v: Setup) =>
		callHandler(standDownPage.load as never, {
			path: `/v/${v.venue.slug}/shows/${v.show.id}/stand-down`,
			params: { venue: v.venue.slug, show: v.show.id },
			person: v.manager
		}),
	'close-of-night page': (v: Setup) =>
		callHandler(closePage.load as never, {
			path: `/v/${v.venue.slug}/shows/${v.show.id}/close`,
			params: { venue: v.venue.slug, show: v.show.id },
			person: v.manager
		})
};

// Statements per request, the venue hook's one included: the checklist and its results, stand-
// downs and sign-off (4), the access check (2) and the freshness check (1) on the checklist
// routes; the show page and Tonight add their crew, scenes and delivery reads, all in parallel; Tonight
// also reads the venue's open faults (one statement when there are none).
// The print and stand-down pages read the kept copy as the crew page does; the close-of-night page
// compares its stored list with its inputs and writes only when they differ (its first read).
const limits = {
	'checks API': 8,
	'show page': 24,
	'crew checklist': 8,
	// Tonight's drifting sensors and their nights are read together: one statement more, one round less.
	Tonight: 19,
	'Tonight, crew': 14,
	'print page': 4,
	'stand-down page': 10,
	'close-of-night page': 18
};

async function counted(run: () => Promise<{ status: number }>) {
	seen.statements.length = 0;
	const answer = await run();
	expect(answer.status).toBe(200);
	// postgres.js asks for the array types once per new connection: setup, not the request's work.
	const statements = seen.statements.filter((s) => !s.query.includes('pg_catalog.pg_type'));
	return {
		count: statements.length,
		writes: statements.filter((s) => /^\s*(insert|update|delete)\b/i.test(s.query)),
		maxParams: Math.max(0, ...statements.map((s) => s.params))
	};
}

const liveChecks = (showId: string) =>
	db
		.select()
		.from(checks)
		.where(and(eq(checks.showId, showId), isNull(checks.removedAt)));

describe('statements per request', () => {
	it('stay the same for 3 scenes and for 30 scenes of 10 props, and a GET writes nothing', async () => {
		const small = await venueWith(3, 1);
		const large = await venueWith(30, 10);
		// The first read of a new show generates its checklist, in chunks of bounded size.
		const first = await counted(() => requests['crew checklist'](large));
		expect(first.writes.length).toBeGreaterThan(0);
		// 300 sensor tests, 300 effect tests, the show stop and the venue's five items.
		expect(await liveChecks(large.show.id)).toHaveLength(606);
		expect(first.maxParams).toBeLessThanOrEqual(500 * 16);
		await counted(() => requests['crew checklist'](small));
		// The close list is stored on its first read; later reads write nothing.
		expect(
			(await counted(() => requests['close-of-night page'](large))).writes.length
		).toBeGreaterThan(0);
		await counted(() => requests['close-of-night page'](small));

		for (const [name, request] of Object.entries(requests)) {
			const a = await counted(() => request(small));
			const b = await counted(() => request(large));
			expect({ name, writes: a.writes.map((w) => w.query) }).toEqual({ name, writes: [] });
			expect({ name, writes: b.writes.map((w) => w.query) }).toEqual({ name, writes: [] });
			expect({ name, count: b.count }).toEqual({ name, count: a.count });
			expect(b.maxParams).toBeLessThan(20);
			expect({ name, count: b.count <= limits[name as keyof typeof limits] }).toEqual({
				name,
				count: true
			});
		}
	});

	it('prints every live check of the night, in words, from the kept copy', async () => {
		const v = await venueWith(4, 2);
		const answer = await requests['print page'](v);
		const body = answer.body as {
			rooms: { name: string; checks: { label: string; detail: string | null; result: string }[] }[];
		};
		const lines = body.rooms.flatMap((r) => r.checks);
		expect(lines).toHaveLength((await liveChecks(v.show.id)).length);
		// Nothing recorded yet: every line shows the blanks to fill in.
		expect(lines.find((l) => l.label === 'Prop 0000: Plate sensor test')).toBeDefined();
		expect(
			lines.filter((l) => !['pass / fail', 'idle ______ present ______'].includes(l.result))
		).toEqual([]);
	});

	it('regenerates a checklist once after its inputs change, then reads without writing', async () => {
		const v = await venueWith(2, 1);
		await counted(() => requests['checks API'](v));
		await db.update(props).set({ name: 'Hanging lantern' }).where(eq(props.id, v.propRows[0].id));
		const after = await counted(() => requests['checks API'](v));
		expect(after.writes.length).toBeGreaterThan(0);
		const labels = (await liveChecks(v.show.id)).map((c) => c.label);
		expect(labels).toContain('Hanging lantern: Plate sensor test');
		expect(labels.some((l) => l.startsWith('Prop 0000'))).toBe(false);
		expect((await counted(() => requests['show page'](v))).writes).toEqual([]);

		// A scene dropped from show nights takes its prop's checks off the list.
		await db.update(scenes).set({ runsOnShowNights: false }).where(eq(scenes.venueId, v.venue.id));
		// The once-a-minute sweep regenerates the coming night's list, so the night's reads only read.
		expect(await refreshUpcomingChecklists(db, new Date())).toBeGreaterThanOrEqual(1);
		expect((await liveChecks(v.show.id)).filter((c) => c.propId !== null)).toEqual([]);
		expect((await counted(() => requests.Tonight(v))).writes).toEqual([]);
	});

	it('answers a repeated read from the kept copy, and a result written by any path shows next read', async () => {
		const v = await venueWith(2, 1);
		const first = await counted(() => requests['checks API'](v));
		// The kept copy: the access check (2) and the show's numbers (1), no checklist reads.
		const again = await counted(() => requests['checks API'](v));
		expect(again.count).toBeLessThan(first.count);
		expect(again.count).toBeLessThanOrEqual(4);
		const [check] = await liveChecks(v.show.id);
		// Written straight to the table, not through the app: the show's counter still rises.
		await db.insert(checkResults).values({
			venueId: v.venue.id,
			showId: v.show.id,
			checkId: check.id,
			outcome: 'fail',
			clientId: crypto.randomUUID()
		});
		const answer = await requests['checks API'](v);
		const body = answer.body as { checks: { id: string; latest: { outcome: string } | null }[] };
		expect(body.checks.find((c) => c.id === check.id)?.latest?.outcome).toBe('fail');
	});
});
