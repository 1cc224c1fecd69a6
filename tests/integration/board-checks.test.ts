import { describe, expect, it, vi } from 'vitest';
import { randomUUID } from 'node:crypto';
import { and, eq } from 'drizzle-orm';
import { checkResults, checks, controllers, props } from '../../src/lib/server/db/schema';
import { storeReadings } from '../../src/lib/server/boards/ingest';
import { recordResult } from '../../src/lib/server/checklists/record';
import { syncChecklist } from '../../src/lib/server/checklists/sync';
import { testDb } from './db';
import { makeNight } from './night';
import { asSession, callHandler, useTestEnv } from './routes';

// Checks that fill themselves: the night's sensor test reads the idle reading off its live board,
// the peak of the seconds after the press, and a result keeps that its readings came from the board.
vi.mock('$env/dynamic/private', () => ({ env: process.env }));
useTestEnv();
const db = testDb();
const board = await import('../../src/routes/api/v/[venue]/shows/[show=uuid]/board/+server');

async function night() {
	const n = await makeNight(db);
	const [c] = await db
		.insert(controllers)
		.values({
			venueId: n.venue.id,
			name: 'Well board',
			supplyV: 5,
			clockHz: 16e6,
			timerBits: 16,
			pwmBits: 8,
			prescaler: 64,
			referenceV: 1.1,
			pinLimitMa: 20,
			supplyRatingA: 2
		})
		.returning();
	await db.update(props).set({ controllerId: c.id }).where(eq(props.id, n.well.id));
	await syncChecklist(db, n.venue.id, n.show.id);
	const [check] = await db
		.select()
		.from(checks)
		.where(and(eq(checks.showId, n.show.id), eq(checks.key, `sensor:${n.plate.id}`)));
	const key = { id: `k-${randomUUID()}`, venueId: n.venue.id, controllerId: c.id };
	let seq = 0;
	const send = (reading: number, at: number) =>
		storeReadings(db, key, [{ sensor: 'plate', seq: ++seq, reading, label: null }], new Date(at));
	return { ...n, check, send };
}

type N = Awaited<ReturnType<typeof night>>;
const ask = (n: N, who: { id: string; name: string | null; email: string }, query = '') =>
	callHandler(board.GET as never, {
		path: `/api/v/${n.venue.slug}/shows/${n.show.id}/board${query}`,
		params: { venue: n.venue.slug, show: n.show.id },
		person: asSession(who),
		routeId: '/api/v/[venue]/shows/[show=uuid]/board'
	});

describe('a sensor test read from its board', () => {
	it('gives the idle reading of the last seconds, then the peak after the press, and the result keeps where they came from', async () => {
		const n = await night();
		const t = Date.now();
		await n.send(1400, t - 8000); // more than 3 s before the latest: not in the idle reading
		await n.send(1480, t - 2500);
		await n.send(1481, t - 1500);

		// the crew member posted on the night sees tonight's idle reading, and when
		const now = await ask(n, n.crewHere);
		expect(now.status).toBe(200);
		const idles = (now.body as { idles: Record<string, { reading: number; at: number }> }).idles;
		expect(idles[n.check.id].reading).toBeCloseTo(1480.5, 9);
		expect(idles[n.check.id].at).toBe(t - 1500);

		// the press: the server's time starts the window
		const press = await ask(n, n.crewHere, `?check=${n.check.id}`);
		const t0 = (press.body as { now: number }).now;
		expect(t0).toBeGreaterThanOrEqual(t);
		await n.send(1530, t0 + 1000);
		await n.send(1562.25, t0 + 2000);
		await n.send(1541, t0 + 3000);
		await n.send(1700, t0 + 6000); // after the five seconds: not counted
		const peakOf = async () => {
			const r = await ask(n, n.crewHere, `?check=${n.check.id}&from=${t0}`);
			expect(r.status).toBe(200);
			return (r.body as { peak: { reading: number; at: number } }).peak;
		};
		expect(await peakOf()).toMatchObject({ reading: 1562.25, at: t0 + 2000 });

		const fromBoard = await recordResult(db, {
			venue: n.ctx('crew'),
			personId: n.crewHere.id,
			showId: n.show.id,
			body: {
				clientId: randomUUID(),
				checkId: n.check.id,
				idleReading: 1480.5,
				presentReading: 1562.25,
				fromBoard: true,
				boardReadAt: new Date(t0 + 2000).toISOString()
			}
		});
		expect(fromBoard.ok).toBe(true);
		if (!fromBoard.ok) return;
		expect(fromBoard.result).toMatchObject({ outcome: 'pass', fromBoard: true });
		expect(fromBoard.result.boardReadAt?.getTime()).toBe(t0 + 2000);

		// a reading the board never sent at that time is kept as typed, not as the board's
		const typed = await recordResult(db, {
			venue: n.ctx('crew'),
			personId: n.crewHere.id,
			showId: n.show.id,
			body: {
				clientId: randomUUID(),
				checkId: n.check.id,
				idleReading: 1480.5,
				presentReading: 1600,
				fromBoard: true,
				boardReadAt: new Date(t0 + 2000).toISOString()
			}
		});
		expect(typed.ok && typed.result).toMatchObject({ fromBoard: false, boardReadAt: null });
		// both rows are there: results are appended
		const rows = await db.select().from(checkResults).where(eq(checkResults.checkId, n.check.id));
		expect(rows.map((r) => r.fromBoard).sort()).toEqual([false, true]);

		// a sensor whose present readings are lower takes the lowest of the window
		await db
			.update(checks)
			.set({
				expected: {
					mode: 'reading',
					band: {
						direction: 'down',
						enter: 1450,
						exit: 1460,
						baselineLow: 1470,
						baselineHigh: 1490
					}
				}
			})
			.where(eq(checks.id, n.check.id));
		expect(await peakOf()).toMatchObject({ reading: 1530, at: t0 + 1000 });
	});

	it('answers only people who may work the night, and has nothing for a quiet board', async () => {
		const n = await night();
		// crew not posted on this night, and a member of another venue
		expect((await ask(n, n.crewOther)).status).toBeGreaterThanOrEqual(403);
		const stranger = await makeNight(db);
		expect((await ask(n, stranger.manager)).status).toBe(404);
		// the show manager may; with no readings, no sensor test is live
		const quiet = await ask(n, n.manager);
		expect(quiet.status).toBe(200);
		expect((quiet.body as { idles: object }).idles).toEqual({});
		// readings older than ten seconds do not make a board live
		await n.send(1480, Date.now() - 15_000);
		expect(((await ask(n, n.manager)).body as { idles: object }).idles).toEqual({});
		// a window it cannot read is refused with words
		const bad = await ask(n, n.manager, `?check=${n.check.id}&from=soon`);
		expect(bad.status).toBe(400);
		expect((bad.body as { message: string }).message).toMatch(/Press the button again/);
	});
});
