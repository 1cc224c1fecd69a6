import { afterEach, describe, expect, it, vi } from 'vitest';
import { readingMinutes, shows } from '../../src/lib/server/db/schema';
import { baselineAlerts, nightlyBaselines } from '../../src/lib/server/boards/baselines';
import { testDb } from './db';
import { makeNight } from './night';
import { answerOf, asSession, eventFor, useTestEnv } from './routes';

// Each night's idle baseline from the per-minute figures in the hour before doors, and what the
// checklist line, Tonight and the sensor page say when it leaves the band or heads for it.
vi.mock('$env/dynamic/private', () => ({ env: process.env }));
useTestEnv();
const db = testDb();
const checklistPage =
	await import('../../src/routes/(app)/v/[venue]/shows/[show=uuid]/checklist/+page.server');
const tonightPage = await import('../../src/routes/(app)/v/[venue]/+page.server');
const sensorPage =
	await import('../../src/routes/(app)/v/[venue]/props/[prop=uuid]/sensors/[sensor=uuid]/+page.server');

afterEach(() => vi.useRealTimers());

type Night = Awaited<ReturnType<typeof makeNight>>;

/** Minutes of the plate before a show's doors (18:00 UTC): each [minutes before doors, mean, max]. */
async function minutes(n: Night, date: string, rows: [number, number, number][]) {
	await db.insert(readingMinutes).values(
		rows.map(([before, mean, max]) => ({
			venueId: n.venue.id,
			sensorId: n.plate.id,
			minute: new Date(Date.parse(`${date}T18:00:00Z`) - before * 60_000),
			count: 600,
			mean,
			sigma: 1,
			min: mean - 2,
			max,
			lastSeq: 1
		}))
	);
}

/** Seven earlier nights, 24 to 30 Sept 2027, each with a baseline from `values`. */
async function earlierNights(n: Night, values: number[]) {
	for (let i = 0; i < values.length; i++) {
		const date = `2027-09-${String(24 + i).padStart(2, '0')}`;
		await db.insert(shows).values({
			venueId: n.venue.id,
			date,
			doorsOpen: new Date(`${date}T18:00:00Z`),
			doorsClose: new Date(`${date}T22:00:00Z`),
			crewCall: new Date(`${date}T16:00:00Z`)
		});
		await minutes(n, date, [
			[30, values[i], values[i] + 2],
			[10, values[i], values[i] + 2]
		]);
	}
}

async function load(
	mod: { load: (e: never) => unknown },
	n: Night,
	person: { id: string; name: string | null; email: string },
	path: string,
	params: Record<string, string>
) {
	const event = await eventFor({ path, params, person: asSession(person) });
	return answerOf(() => mod.load(event as never));
}

describe('nightly baselines', () => {
	it('takes the mean of the idle minutes in the hour before doors, leaving out the rest', async () => {
		const n = await makeNight(db);
		await minutes(n, '2027-10-01', [
			[50, 1478, 1480], // idle
			[20, 1482, 1484], // idle: with the one above, a mean of 1480
			[15, 1510, 1540], // a hand in during the checks: max above enter (1495), left out
			[75, 1400, 1402] // before the window
		]);
		// after doors: not part of the baseline
		await db.insert(readingMinutes).values({
			venueId: n.venue.id,
			sensorId: n.plate.id,
			minute: new Date('2027-10-01T18:05:00Z'),
			count: 600,
			mean: 1300,
			sigma: 1,
			min: 1299,
			max: 1301,
			lastSeq: 2
		});
		const nights = await nightlyBaselines(db, n.venue.id, [n.plate.id], { upTo: '2027-10-02' });
		expect(nights).toEqual([
			{
				showId: n.show.id,
				date: '2027-10-01',
				sensorId: n.plate.id,
				baseline: 1480,
				readings: 1200
			}
		]);
		// another venue's sensor id gives nothing here
		const other = await makeNight(db);
		expect(
			await nightlyBaselines(db, other.venue.id, [n.plate.id], { upTo: '2027-10-02' })
		).toEqual([]);
	});

	it('says on the checklist line, on Tonight and on the sensor page when the baseline is heading out of its band', async () => {
		const n = await makeNight(db);
		// band 1,472.5 to 1,487.5: climbing 1.5 a night from 1474, tonight 1484.5, the edge in ~2 nights
		await earlierNights(n, [1474, 1475.6, 1476.9, 1478.6, 1480, 1481.4, 1483.1]);
		await minutes(n, '2027-10-01', [[20, 1484.5, 1486]]);
		vi.useFakeTimers({ toFake: ['Date'] });
		vi.setSystemTime(new Date('2027-10-01T17:45:00Z'));

		const alerts = await baselineAlerts(db, n.venue.id, n.show);
		expect(alerts).toHaveLength(1);
		expect(alerts[0]).toMatchObject({ sensorId: n.plate.id, state: 'trending' });
		expect(alerts[0].words).toBe(
			'The idle baseline is rising by 1.5 a night (tonight 1,484.5) and would leave the calibrated band 1,472.5 to 1,487.5 in about 2 nights.'
		);

		// the crew member posted tonight sees it on the sensor test line
		const list = await load(
			checklistPage,
			n,
			n.crewHere,
			`/v/${n.venue.slug}/shows/${n.show.id}/checklist`,
			{ venue: n.venue.slug, show: n.show.id }
		);
		expect(list.status).toBe(200);
		const body = list.body as unknown as {
			baselineNotes: Record<string, string>;
			checklist: { checks: { key: string; kind: string }[] };
		};
		const sensorCheck = body.checklist.checks.find((c) => c.key === `sensor:${n.plate.id}`);
		expect(sensorCheck).toBeTruthy();
		expect(body.baselineNotes[sensorCheck!.key]).toBe(alerts[0].words);

		// Tonight lists it
		const tonight = await load(tonightPage, n, n.manager, `/v/${n.venue.slug}`, {
			venue: n.venue.slug
		});
		expect((tonight.body as { drifting: { name: string; words: string }[] }).drifting).toEqual([
			expect.objectContaining({ name: 'Well: Plate', words: alerts[0].words })
		]);

		// the sensor page has the eight nights and the same words
		const page = await load(
			sensorPage,
			n,
			n.manager,
			`/v/${n.venue.slug}/props/${n.well.id}/sensors/${n.plate.id}`,
			{ venue: n.venue.slug, prop: n.well.id, sensor: n.plate.id }
		);
		const history = (
			page.body as { baselines: { nights: { date: string }[]; words: string; window: string } }
		).baselines;
		expect(history.nights.map((x) => x.date)).toHaveLength(8);
		expect(history.words).toBe(alerts[0].words);
		expect(history.window).toBe('the hour before doors open');
	});

	it('says the baseline has left the band when tonight is outside it, and nothing when all is steady', async () => {
		const n = await makeNight(db);
		await earlierNights(n, [1480, 1479, 1481, 1480]);
		await minutes(n, '2027-10-01', [[20, 1480.5, 1482]]);
		await minutes(n, '2027-10-02', [[20, 1490, 1492]]);
		vi.useFakeTimers({ toFake: ['Date'] });
		vi.setSystemTime(new Date('2027-10-01T17:45:00Z'));
		// 1 Oct: steady and inside
		expect(await baselineAlerts(db, n.venue.id, n.show)).toEqual([]);
		const steady = await load(
			checklistPage,
			n,
			n.crewHere,
			`/v/${n.venue.slug}/shows/${n.show.id}/checklist`,
			{ venue: n.venue.slug, show: n.show.id }
		);
		expect((steady.body as { baselineNotes: object }).baselineNotes).toEqual({});
		// 2 Oct: 1490 is above the band's top at 1487.5
		const list = await load(
			checklistPage,
			n,
			n.manager,
			`/v/${n.venue.slug}/shows/${n.other.id}/checklist`,
			{ venue: n.venue.slug, show: n.other.id }
		);
		expect((list.body as { baselineNotes: Record<string, string> }).baselineNotes).toEqual({
			[`sensor:${n.plate.id}`]:
				"Tonight's idle baseline (1,490, the hour before doors open) is above the calibrated band 1,472.5 to 1,487.5: the sensor has drifted. Recalibrate it or look for what changed."
		});
	});
});
