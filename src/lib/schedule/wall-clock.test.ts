import { describe, expect, it } from 'vitest';
import { fromZonedTime } from 'date-fns-tz';
import { expandSeason } from './season';
import { formatDate, parseDate, wallClock, wallToInstant } from './wall-time';

const DAY_MS = 86_400_000;
const daysOf = (year: number) => {
	const out: string[] = [];
	for (let t = parseDate(`${year}-01-01`)!.getTime(); ; t += DAY_MS) {
		const d = formatDate(new Date(t));
		if (!d.startsWith(String(year))) return out;
		out.push(d);
	}
};
// Around both clock changes in each zone, and a show's usual hours.
const TIMES = [
	'00:00',
	'00:59',
	'01:00',
	'01:30',
	'01:59',
	'02:00',
	'02:30',
	'03:00',
	'19:00',
	'23:30'
];

// Wall times that a clock change skips or repeats. RFC 5545 §3.3.5 (the rule Gloaming follows): a
// skipped time uses the offset from before the gap, a repeated time is its first occurrence.
// fromZonedTime resolves these its own way, so here the instants are written out by hand.
// 2027: US DST 14 Mar to 7 Nov at 02:00 local (15 U.S.C. 260a); UK BST 28 Mar to 31 Oct at
// 01:00 UTC (The Summer Time Order 2002).
const CHANGES: Record<string, Record<string, string>> = {
	'America/New_York': {
		'2027-03-14 02:00': '2027-03-14T07:00:00.000Z',
		'2027-03-14 02:30': '2027-03-14T07:30:00.000Z',
		'2027-11-07 01:00': '2027-11-07T05:00:00.000Z',
		'2027-11-07 01:30': '2027-11-07T05:30:00.000Z',
		'2027-11-07 01:59': '2027-11-07T05:59:00.000Z'
	},
	'Europe/London': {
		'2027-03-28 01:00': '2027-03-28T01:00:00.000Z',
		'2027-03-28 01:30': '2027-03-28T01:30:00.000Z',
		'2027-03-28 01:59': '2027-03-28T01:59:00.000Z',
		'2027-10-31 01:00': '2027-10-31T00:00:00.000Z',
		'2027-10-31 01:30': '2027-10-31T00:30:00.000Z',
		'2027-10-31 01:59': '2027-10-31T00:59:00.000Z'
	}
};

describe('wall time by the zone table, against date-fns-tz fromZonedTime', () => {
	for (const zone of Object.keys(CHANGES)) {
		it(`gives the reference instant for every day of 2027 in ${zone}, and the rule at the changes`, () => {
			const days = daysOf(2027);
			const at = wallClock(zone, days[0], days[days.length - 1]);
			const wrong: string[] = [];
			for (const day of days)
				for (const time of TIMES) {
					// date-fns-tz 3.2 fromZonedTime: the reference for the zone's offset at a wall time.
					const reference =
						CHANGES[zone][`${day} ${time}`] ??
						fromZonedTime(`${day}T${time}:00`, zone).toISOString();
					const table = at(day, time).toISOString();
					const direct = wallToInstant(day, time, zone).toISOString();
					if (table !== reference || direct !== reference)
						wrong.push(`${day} ${time}: ${table} / ${direct}, reference ${reference}`);
				}
			expect(wrong).toEqual([]);
		});
	}

	it('expands a nightly season across both clock changes to the reference instants', () => {
		for (const zone of Object.keys(CHANGES)) {
			const nights = expandSeason({
				timeZone: zone,
				firstNight: '2027-01-01',
				rule: 'FREQ=DAILY;UNTIL=20271231',
				doorsOpen: '01:30',
				doorsClose: '03:00',
				crewCallMinutesBefore: 30,
				darkNights: ['2027-07-04']
			});
			expect(nights).toHaveLength(364);
			const reference = (date: string, time: string) =>
				CHANGES[zone][`${date} ${time}`] ?? fromZonedTime(`${date}T${time}:00`, zone).toISOString();
			for (const n of nights) {
				expect([n.date, n.doorsOpen.toISOString()]).toEqual([n.date, reference(n.date, '01:30')]);
				expect([n.date, n.doorsClose.toISOString()]).toEqual([n.date, reference(n.date, '03:00')]);
			}
		}
	});
});
