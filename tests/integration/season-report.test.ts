import { describe, expect, it, vi } from 'vitest';
import {
	faultEvents,
	faults,
	guestCounts,
	incidents,
	memberships,
	props,
	seasons,
	shows,
	signOffs,
	standDowns
} from '../../src/lib/server/db/schema';
import { makePerson, makeVenue, testDb } from './db';
import { makeNight } from './night';
import { asSession, callHandler, useTestEnv } from './routes';

// The season report page against a seeded season, worked by hand below, and the statements it
// sends: the same for a small and a larger season (grouped in SQL, not one query per prop or night).
const seen = vi.hoisted(() => ({ statements: [] as string[] }));
vi.mock('$env/dynamic/private', () => ({ env: process.env }));
vi.mock('$lib/server/db', async () => {
	const { createDb } = await import('../../src/lib/server/db/client');
	const client = createDb(process.env.DATABASE_URL!, {
		max: 10,
		onStatement: (query) => seen.statements.push(query)
	});
	return { db: client.db, pg: client.sql, closeDb: () => client.sql.end() };
});
useTestEnv();
const db = testDb();
const page =
	await import('../../src/routes/(app)/v/[venue]/seasons/[season=uuid]/report/+page.server');

const at = (s: string) => new Date(`${s}:00Z`);

/**
 * makeNight's venue (Well in the Well room, Drop in the Barn, both show-ready) with a season of
 * five nights, 18:00–22:00 UTC: 1 and 2 Oct 2026 run, 3 Oct dark, 4 Oct cancelled, one in 2099,
 * and 6 Oct dark without a show row.
 * - 1 Oct signed off; guests counted 100 then corrected to 120; 2 Oct counted 80 → 200 guests.
 * - Well: fault "stops the scene" reported 1 Oct 21:00, repaired 2 Oct 12:00, re-tested and
 *   passed 2 Oct 18:30 → down 60 + 30 = 90 of 480 show minutes.
 * - Drop: stood down for 2 Oct (240 min down) and a degraded fault that night (not a failure).
 * - Incidents: two near misses on 1 Oct, a show stop of 15 min on 2 Oct.
 */
async function seasonWith(extraProps = 0, extraNights = 0) {
	const n = await makeNight(db);
	const designer = await makePerson(db, 'Dee Signer');
	await db
		.insert(memberships)
		.values({ venueId: n.venue.id, personId: designer.id, role: 'designer' });
	const [season] = await db
		.insert(seasons)
		.values({
			venueId: n.venue.id,
			name: 'Autumn 2026',
			firstNight: '2026-10-01',
			rule: 'FREQ=DAILY;COUNT=4',
			doorsOpen: '18:00',
			doorsClose: '22:00',
			crewCallMinutesBefore: 120,
			// Left out by the rule, so no show row: still a dark night of the season.
			darkNights: ['2026-10-06']
		})
		.returning();
	const night = (date: string, status: 'scheduled' | 'dark' | 'cancelled' = 'scheduled') => ({
		venueId: n.venue.id,
		seasonId: season.id,
		date,
		status,
		doorsOpen: at(`${date}T18:00`),
		doorsClose: at(`${date}T22:00`),
		crewCall: at(`${date}T16:00`)
	});
	const [n1, n2] = await db
		.insert(shows)
		.values([
			night('2026-10-01'),
			night('2026-10-02'),
			night('2026-10-03', 'dark'),
			night('2026-10-04', 'cancelled'),
			night('2099-10-05'),
			...Array.from({ length: extraNights }, (_, i) =>
				night(`2026-09-${String(i + 1).padStart(2, '0')}`, 'dark')
			)
		])
		.returning();
	await db.insert(signOffs).values({ venueId: n.venue.id, showId: n1.id, personId: n.manager.id });
	await db.insert(guestCounts).values([
		{ venueId: n.venue.id, showId: n1.id, guests: 100, at: at('2026-10-01T22:10') },
		{ venueId: n.venue.id, showId: n1.id, guests: 120, at: at('2026-10-01T22:20') },
		{ venueId: n.venue.id, showId: n2.id, guests: 80, at: at('2026-10-02T22:10') }
	]);
	const [wellFault] = await db
		.insert(faults)
		.values({
			venueId: n.venue.id,
			propId: n.well.id,
			roomId: n.room.id,
			showId: n1.id,
			severity: 'stops_scene',
			seen: 'Plate reads nothing',
			reportedAt: at('2026-10-01T21:00')
		})
		.returning();
	await db.insert(faultEvents).values([
		{
			venueId: n.venue.id,
			faultId: wellFault.id,
			kind: 'repaired',
			action: 'Reseated the plate lead',
			minutes: 20,
			at: at('2026-10-02T12:00')
		},
		{
			venueId: n.venue.id,
			faultId: wellFault.id,
			kind: 'retested',
			passed: true,
			at: at('2026-10-02T18:30')
		}
	]);
	await db.insert(faults).values({
		venueId: n.venue.id,
		propId: n.drop.id,
		roomId: n.barn.id,
		showId: n2.id,
		severity: 'degraded',
		seen: 'Drop is slow',
		reportedAt: at('2026-10-02T19:00')
	});
	await db.insert(standDowns).values({
		venueId: n.venue.id,
		showId: n2.id,
		propId: n.drop.id,
		reason: 'Valve sticking',
		personId: n.manager.id
	});
	const incident = (
		showId: string,
		kind: 'near_miss' | 'show_stop',
		hhmm: string,
		stoppedMinutes = 0
	) => ({
		venueId: n.venue.id,
		showId,
		kind,
		happenedAt: at(hhmm),
		whatHappened: 'Something',
		whatWasDone: 'Something done',
		firstAid: false,
		stoppedMinutes
	});
	await db
		.insert(incidents)
		.values([
			incident(n1.id, 'near_miss', '2026-10-01T19:00'),
			incident(n1.id, 'near_miss', '2026-10-01T20:00'),
			incident(n2.id, 'show_stop', '2026-10-02T20:00', 15)
		]);
	// For the larger season: more props in service, each with a fault, outside the figures above.
	for (let i = 0; i < extraProps; i++) {
		const [p] = await db
			.insert(props)
			.values({
				venueId: n.venue.id,
				name: `Zed ${i}`,
				roomId: n.barn.id,
				status: 'installed'
			})
			.returning();
		await db.insert(faults).values({
			venueId: n.venue.id,
			propId: p.id,
			roomId: n.barn.id,
			severity: 'cosmetic',
			seen: 'Scuffed',
			reportedAt: at('2026-10-02T19:30')
		});
	}
	return { n, designer, season };
}

type Seeded = Awaited<ReturnType<typeof seasonWith>>;
const load = (s: Seeded, person: { id: string; name: string | null; email: string }) =>
	callHandler(page.load as never, {
		path: `/v/${s.n.venue.slug}/seasons/${s.season.id}/report`,
		params: { venue: s.n.venue.slug, season: s.season.id },
		person: asSession(person)
	});

describe('season report', () => {
	it('shows the nights, guests, uptime, MTBF, MTTR, faults and incidents of the season', async () => {
		const s = await seasonWith();
		const answer = await load(s, s.n.manager);
		expect(answer.status).toBe(200);
		const data = answer.body as Record<string, never> & {
			props: { name: string }[];
			nights: unknown[];
		};
		expect(data.totals).toEqual({
			scheduled: 3,
			run: 2,
			signedOff: 1,
			dark: 2,
			cancelled: 1,
			guests: 200,
			counted: 2
		});
		// Two nights of 4 h have run.
		expect(data.showTime).toBe('8 h');
		expect(data.hasRun).toBe(true);
		// Venue: 2 props × 480 = 960 prop-minutes; down 90 + 240 = 330; working 630.
		// Uptime 630 / 960 = 65.625 % → 65.6 %. One failure: MTBF 630 min = 10 h 30 min.
		// MTTR: 1 Oct 21:00 to 2 Oct 18:30 = 21 h 30 min.
		expect(data.venueFigures).toEqual({
			uptime: '65.6 %',
			failures: 1,
			repaired: 1,
			mtbf: '10 h 30 min',
			mttr: '21 h 30 min',
			down: '5 h 30 min'
		});
		// Props by name: Drop, then Well.
		expect(data.props).toMatchObject([
			// Drop: stood down for 2 Oct → 240 of 480 down, uptime 50 %, no failures.
			{ name: 'Drop', roomName: 'Barn', uptime: '50 %', down: '4 h', failures: 0, mtbf: '—' },
			// Well: 90 of 480 down → 390 / 480 = 81.25 % → 81.3 %; MTBF 390 min = 6 h 30 min.
			{
				name: 'Well',
				roomName: 'Well room',
				uptime: '81.3 %',
				down: '1 h 30 min',
				failures: 1,
				mtbf: '6 h 30 min',
				mttr: '21 h 30 min'
			}
		]);
		expect((data.mostDown as { name: string }[]).map((p) => p.name)).toEqual(['Drop', 'Well']);
		expect(data.faultsByProp).toMatchObject([
			{ name: 'Drop', stops_scene: 0, degraded: 1, cosmetic: 0, total: 1 },
			{ name: 'Well', stops_scene: 1, degraded: 0, cosmetic: 0, total: 1 }
		]);
		expect(data.faultsByRoom).toEqual(
			expect.arrayContaining([
				expect.objectContaining({ name: 'Barn', degraded: 1, total: 1 }),
				expect.objectContaining({ name: 'Well room', stops_scene: 1, total: 1 })
			])
		);
		expect(data.incidentsByKind).toEqual([
			{ kind: 'near_miss', label: 'Near miss', count: 2, stopped: '—' },
			{ kind: 'show_stop', label: 'Show stop', count: 1, stopped: '15 min' }
		]);
		expect(data.nights).toHaveLength(5);
		expect(data.nights[0]).toMatchObject({ status: 'scheduled', signedOff: true, guests: 120 });
	});

	it('is for owners, show managers and designers: crew 403, another venue 404', async () => {
		const s = await seasonWith();
		expect((await load(s, s.designer)).status).toBe(200);
		expect((await load(s, s.n.crewHere)).status).toBe(403);
		const stranger = await makePerson(db, 'Elsewhere Owner');
		await makeVenue(db, [[stranger.id, 'owner']]);
		expect((await load(s, stranger)).status).toBe(404);
		// A season of another venue, asked for through this venue's address, is not found.
		const other = await seasonWith();
		const mixed = await callHandler(page.load as never, {
			path: `/v/${s.n.venue.slug}/seasons/${other.season.id}/report`,
			params: { venue: s.n.venue.slug, season: other.season.id },
			person: asSession(s.n.manager)
		});
		expect(mixed.status).toBe(404);
	});

	it('sends the same number of statements for a larger season', async () => {
		const small = await seasonWith();
		const large = await seasonWith(12, 20);
		const count = async (s: Seeded) => {
			seen.statements.length = 0;
			expect((await load(s, s.n.manager)).status).toBe(200);
			return seen.statements.filter((q) => !q.includes('pg_catalog.pg_type')).length;
		};
		await count(small);
		const a = await count(small);
		const b = await count(large);
		expect(b).toBe(a);
		// The venue hook, the season, five grouped reads, the faults and their events.
		expect(a).toBeLessThanOrEqual(12);
	});
});
