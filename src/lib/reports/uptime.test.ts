import { describe, expect, it } from 'vitest';
import { mergeSpans, mostDowntime, seasonUptime, type ReportNight } from './uptime';

// Definitions: availability, mean operating time between failures (MTBF) and mean time to
// restoration (MTTR) as in IEC 60050-192 (// memory: term names recalled; "mean time to
// restoration" is IEC 60050-191 term 191-13-08 as cited by IEC 61703), measured over show minutes
// as written at the top of uptime.ts. The worked example below is done by hand.

const at = (s: string) => new Date(`${s}:00Z`);
const night = (id: string, d: string): ReportNight => ({
	id,
	doorsOpen: at(`${d}T18:00`),
	doorsClose: at(`${d}T22:00`)
});

// Three nights, 18:00–22:00 each; it is noon on the third, so it has not begun.
// Show minutes = 2 nights × 240 min = 480.
const nights = [night('n1', '2027-10-01'), night('n2', '2027-10-02'), night('n3', '2027-10-03')];
const now = at('2027-10-03T12:00');

const worked = () =>
	seasonUptime({
		nights,
		propIds: ['well', 'drop', 'gate'],
		faults: [
			// Well: reported n1 21:00, verified n2 18:30.
			// Down inside doors: n1 21:00–22:00 = 60, n2 18:00–18:30 = 30 → 90 min.
			// Working 480 − 90 = 390; uptime 390 / 480 = 0.8125; 1 failure, MTBF 390 / 1 = 390 min.
			// MTTR: 21:00 to 18:30 the next day = 21 h 30 min = 1290 min.
			{ propId: 'well', reportedAt: at('2027-10-01T21:00'), verifiedAt: at('2027-10-02T18:30') },
			// Drop: reported n2 19:00, verified n2 20:00, inside its stand-down for n2 (below), so it
			// adds no down minutes; repair time 60 min.
			{ propId: 'drop', reportedAt: at('2027-10-02T19:00'), verifiedAt: at('2027-10-02T20:00') },
			// Gate: reported n2 21:30 and still open at noon on n3: down n2 21:30–22:00 = 30 min
			// (the morning is outside doors). Working 450; uptime 450 / 480 = 0.9375; MTBF 450;
			// no verified repair, so no MTTR.
			{ propId: 'gate', reportedAt: at('2027-10-02T21:30'), verifiedAt: null },
			// Gate, long before the season: no down minutes and not a failure of this season.
			{ propId: 'gate', reportedAt: at('2027-08-01T20:00'), verifiedAt: at('2027-08-02T10:00') }
		],
		standDowns: [
			// Drop stood down for n2: 240 min down. Working 240; uptime 0.5; 1 failure, MTBF 240;
			// MTTR 60.
			{ propId: 'drop', showId: 'n2' },
			// Stood down for n3, which has not begun: counts nothing yet.
			{ propId: 'drop', showId: 'n3' }
		],
		now
	});

describe('season uptime, MTBF and MTTR (worked example above)', () => {
	it('counts show minutes only inside doors open..close of nights that have begun', () => {
		expect(worked().showMinutes).toBe(480);
	});

	it('works out each prop', () => {
		const byId = Object.fromEntries(worked().props.map((p) => [p.propId, p]));
		expect(byId.well).toMatchObject({
			downMinutes: 90,
			workingMinutes: 390,
			uptime: 0.8125,
			failures: 1,
			mtbf: 390,
			mttr: 1290
		});
		expect(byId.drop).toMatchObject({
			downMinutes: 240,
			uptime: 0.5,
			failures: 1,
			mtbf: 240,
			mttr: 60
		});
		expect(byId.gate).toMatchObject({
			downMinutes: 30,
			uptime: 0.9375,
			failures: 1,
			repaired: 0,
			mtbf: 450,
			mttr: null
		});
	});

	it('works out the venue over all props together', () => {
		// Prop-minutes 3 × 480 = 1440; down 90 + 240 + 30 = 360; working 1080.
		// Uptime 1080 / 1440 = 0.75. Failures 3: MTBF 1080 / 3 = 360 min.
		// MTTR over the 2 verified repairs: (1290 + 60) / 2 = 675 min.
		expect(worked().venue).toMatchObject({
			showMinutes: 1440,
			downMinutes: 360,
			workingMinutes: 1080,
			uptime: 0.75,
			failures: 3,
			repaired: 2,
			mtbf: 360,
			mttr: 675
		});
	});

	it('ranks the props with most downtime, leaving out those never down', () => {
		const report = seasonUptime({ nights, propIds: ['quiet'], faults: [], standDowns: [], now });
		expect(report.props[0]).toMatchObject({ uptime: 1, failures: 0, mtbf: null, mttr: null });
		expect(mostDowntime([...worked().props, ...report.props]).map((p) => p.propId)).toEqual([
			'drop',
			'well',
			'gate'
		]);
	});

	it('has no uptime when no night has begun', () => {
		const early = seasonUptime({
			nights,
			propIds: ['well'],
			faults: [],
			standDowns: [],
			now: at('2027-09-01T12:00')
		});
		expect(early.showMinutes).toBe(0);
		expect(early.venue.uptime).toBeNull();
		expect(early.props[0].uptime).toBeNull();
	});

	it('counts a night still running up to now', () => {
		// n1 from 18:00 to 19:30 = 90 show minutes so far.
		const running = seasonUptime({
			nights,
			propIds: [],
			faults: [],
			standDowns: [],
			now: at('2027-10-01T19:30')
		});
		expect(running.showMinutes).toBe(90);
	});

	it('merges overlapping spans so that a minute is counted once', () => {
		expect(
			mergeSpans([
				[5, 10],
				[0, 6],
				[20, 30],
				[30, 31],
				[40, 40]
			])
		).toEqual([
			[0, 10],
			[20, 31]
		]);
	});
});
