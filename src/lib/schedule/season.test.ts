import { formatInTimeZone } from 'date-fns-tz';
import { describe, expect, it } from 'vitest';
import {
	buildRule,
	describeRule,
	expandSeason,
	parseSeasonRule,
	ruleToParts,
	SeasonRuleError,
	type SeasonInput
} from './season';
import { wallToInstant } from './wall-time';

const newYork = (firstNight: string, rule: string): SeasonInput => ({
	timeZone: 'America/New_York',
	firstNight,
	rule,
	doorsOpen: '09:00',
	doorsClose: '10:00',
	crewCallMinutesBefore: 0
});

const dates = (input: SeasonInput) => expandSeason(input).map((night) => night.date);

const local = (instant: Date, timeZone: string) =>
	formatInTimeZone(instant, timeZone, 'yyyy-MM-dd HH:mm');

describe('expandSeason against the RFC 5545 §3.8.5.3 examples (DTSTART 09:00 America/New_York)', () => {
	it('every other week on Monday, Wednesday and Friday until 24 Dec 1997 gives 25 dates', () => {
		// RFC 5545 §3.8.5.3: FREQ=WEEKLY;INTERVAL=2;UNTIL=19971224T000000Z;WKST=SU;BYDAY=MO,WE,FR
		const rule = 'FREQ=WEEKLY;INTERVAL=2;UNTIL=19971224T000000Z;WKST=SU;BYDAY=MO,WE,FR';
		expect(dates(newYork('1997-09-01', rule))).toEqual([
			...[1, 3, 5, 15, 17, 19, 29].map((d) => `1997-09-${String(d).padStart(2, '0')}`),
			...[1, 3, 13, 15, 17, 27, 29, 31].map((d) => `1997-10-${String(d).padStart(2, '0')}`),
			...[10, 12, 14, 24, 26, 28].map((d) => `1997-11-${d}`),
			...[8, 10, 12, 22].map((d) => `1997-12-${String(d).padStart(2, '0')}`)
		]);
	});

	it('keeps 09:00 local on both sides of the 1997 change from EDT to EST', () => {
		// RFC 5545 §3.8.5.3 lists the times as 09:00 local; 1997 US DST ended on the last Sunday of
		// October, 26 Oct (Uniform Time Act of 1966 as amended in 1986), so UTC moves 13:00 -> 14:00.
		const rule = 'FREQ=WEEKLY;INTERVAL=2;UNTIL=19971224T000000Z;WKST=SU;BYDAY=MO,WE,FR';
		const nights = expandSeason(newYork('1997-09-01', rule));
		expect(nights[0].doorsOpen.toISOString()).toBe('1997-09-01T13:00:00.000Z');
		expect(nights.at(-1)!.doorsOpen.toISOString()).toBe('1997-12-22T14:00:00.000Z');
		for (const night of nights) {
			expect(local(night.doorsOpen, 'America/New_York')).toBe(`${night.date} 09:00`);
		}
	});

	it('the first Friday of ten months', () => {
		// RFC 5545 §3.8.5.3: FREQ=MONTHLY;COUNT=10;BYDAY=1FR from 19970905T090000
		expect(dates(newYork('1997-09-05', 'FREQ=MONTHLY;COUNT=10;BYDAY=1FR'))).toEqual([
			'1997-09-05',
			'1997-10-03',
			'1997-11-07',
			'1997-12-05',
			'1998-01-02',
			'1998-02-06',
			'1998-03-06',
			'1998-04-03',
			'1998-05-01',
			'1998-06-05'
		]);
	});

	it('every day in January for three years gives 93 dates, the UTC UNTIL included', () => {
		// RFC 5545 §3.8.5.3: FREQ=DAILY;UNTIL=20000131T140000Z;BYMONTH=1 from 19980101T090000;
		// 31 Jan 2000 09:00 EST is exactly 14:00Z, and UNTIL is inclusive (§3.3.10).
		const result = dates(newYork('1998-01-01', 'FREQ=DAILY;UNTIL=20000131T140000Z;BYMONTH=1'));
		expect(result).toHaveLength(93);
		expect(result[0]).toBe('1998-01-01');
		expect(result.at(-1)).toBe('2000-01-31');
		expect(result.every((date) => date.slice(5, 7) === '01')).toBe(true);
	});

	it('every other week on Tuesday and Thursday for 8 occurrences', () => {
		// RFC 5545 §3.8.5.3: FREQ=WEEKLY;INTERVAL=2;COUNT=8;WKST=SU;BYDAY=TU,TH from 19970902T090000
		const rule = 'FREQ=WEEKLY;INTERVAL=2;COUNT=8;WKST=SU;BYDAY=TU,TH';
		expect(dates(newYork('1997-09-02', rule))).toEqual([
			'1997-09-02',
			'1997-09-04',
			'1997-09-16',
			'1997-09-18',
			'1997-09-30',
			'1997-10-02',
			'1997-10-14',
			'1997-10-16'
		]);
	});

	it('every 10 days for 5 occurrences', () => {
		// RFC 5545 §3.8.5.3: FREQ=DAILY;INTERVAL=10;COUNT=5 from 19970902T090000
		expect(dates(newYork('1997-09-02', 'RRULE:FREQ=DAILY;INTERVAL=10;COUNT=5'))).toEqual([
			'1997-09-02',
			'1997-09-12',
			'1997-09-22',
			'1997-10-02',
			'1997-10-12'
		]);
	});
});

describe('expandSeason across DST changes', () => {
	it('Europe/London: doors stay at 19:00 local when BST ends, UTC moves an hour later', () => {
		// Europe/London: BST ends last Sunday of October (Summer Time Order / EU directive 2000/84/EC),
		// which in 2026 is 25 Oct: BST is UTC+1 before it, GMT is UTC+0 after.
		const nights = expandSeason({
			timeZone: 'Europe/London',
			firstNight: '2026-10-23',
			rule: { nightsOfWeek: ['FR', 'SA'], until: '2026-10-31' },
			doorsOpen: '19:00',
			doorsClose: '23:00',
			crewCallMinutesBefore: 120
		});
		expect(nights.map((n) => n.date)).toEqual([
			'2026-10-23',
			'2026-10-24',
			'2026-10-30',
			'2026-10-31'
		]);
		expect(nights.map((n) => n.doorsOpen.toISOString())).toEqual([
			'2026-10-23T18:00:00.000Z',
			'2026-10-24T18:00:00.000Z',
			'2026-10-30T19:00:00.000Z',
			'2026-10-31T19:00:00.000Z'
		]);
		for (const night of nights) {
			expect(local(night.doorsOpen, 'Europe/London')).toBe(`${night.date} 19:00`);
			expect(local(night.doorsClose, 'Europe/London')).toBe(`${night.date} 23:00`);
			expect(local(night.crewCall, 'Europe/London')).toBe(`${night.date} 17:00`);
		}
	});

	it('America/New_York: doors stay at 19:00 local when DST ends, UTC moves an hour later', () => {
		// US: DST ends first Sunday of November (Energy Policy Act of 2005), in 2026 on 1 Nov:
		// EDT is UTC-4 before it, EST is UTC-5 after.
		const nights = expandSeason({
			timeZone: 'America/New_York',
			firstNight: '2026-10-30',
			rule: 'FREQ=WEEKLY;BYDAY=FR,SA;COUNT=4',
			doorsOpen: '19:00',
			doorsClose: '22:30',
			crewCallMinutesBefore: 90
		});
		expect(nights.map((n) => [n.date, n.doorsOpen.toISOString()])).toEqual([
			['2026-10-30', '2026-10-30T23:00:00.000Z'],
			['2026-10-31', '2026-10-31T23:00:00.000Z'],
			['2026-11-06', '2026-11-07T00:00:00.000Z'],
			['2026-11-07', '2026-11-08T00:00:00.000Z']
		]);
		expect(nights[3].doorsOpen.getTime() - nights[1].doorsOpen.getTime()).toBe(
			(7 * 24 + 1) * 3_600_000
		);
		for (const night of nights) {
			expect(local(night.doorsOpen, 'America/New_York')).toBe(`${night.date} 19:00`);
			expect(local(night.crewCall, 'America/New_York')).toBe(`${night.date} 17:30`);
		}
	});

	it('holds 19:00 on the very day the clocks change', () => {
		// Europe/London: BST ends last Sunday of October (Summer Time Order / EU directive 2000/84/EC),
		// 25 Oct 2026, so that evening is GMT. US: DST ends first Sunday of November (Energy Policy Act
		// of 2005), 1 Nov 2026, so that evening is EST (UTC-5).
		const sunday = (timeZone: string, firstNight: string) =>
			expandSeason({
				timeZone,
				firstNight,
				rule: 'FREQ=WEEKLY;BYDAY=SA,SU;COUNT=2',
				doorsOpen: '19:00',
				doorsClose: '23:00',
				crewCallMinutesBefore: 0
			}).map((n) => n.doorsOpen.toISOString());
		expect(sunday('Europe/London', '2026-10-24')).toEqual([
			'2026-10-24T18:00:00.000Z',
			'2026-10-25T19:00:00.000Z'
		]);
		expect(sunday('America/New_York', '2026-10-31')).toEqual([
			'2026-10-31T23:00:00.000Z',
			'2026-11-02T00:00:00.000Z'
		]);
	});

	it('compares a UTC UNTIL with the real doors-open instant', () => {
		// RFC 5545 §3.3.10: UNTIL is an inclusive bound and is given in UTC when DTSTART has a time
		// zone. 22:00Z on 31 Oct 2026 is 18:00 EDT, before 19:00 doors, so 31 Oct is not a night;
		// 23:00Z is 19:00 EDT exactly, so it is.
		const season = (until: string) =>
			dates({
				timeZone: 'America/New_York',
				firstNight: '2026-10-30',
				rule: `FREQ=DAILY;UNTIL=${until}`,
				doorsOpen: '19:00',
				doorsClose: '23:00',
				crewCallMinutesBefore: 0
			});
		expect(season('20261031T220000Z')).toEqual(['2026-10-30']);
		expect(season('20261031T230000Z')).toEqual(['2026-10-30', '2026-10-31']);
	});

	it('doors closing after midnight land on the next day, even on the night the clocks go back', () => {
		// US: DST ends first Sunday of November (Energy Policy Act of 2005): 1 Nov 2026 at 02:00 EDT.
		// RFC 5545 §3.3.5: a repeated local time means its first occurrence, 01:30 EDT = 05:30Z.
		const [night] = expandSeason({
			timeZone: 'America/New_York',
			firstNight: '2026-10-31',
			rule: 'FREQ=DAILY;COUNT=1',
			doorsOpen: '19:00',
			doorsClose: '01:30',
			crewCallMinutesBefore: 60
		});
		expect(night.doorsClose.toISOString()).toBe('2026-11-01T05:30:00.000Z');
		expect(night.crewCall.toISOString()).toBe('2026-10-31T22:00:00.000Z');
	});
});

describe('wallToInstant', () => {
	it('takes the first of a repeated local time', () => {
		// RFC 5545 §3.3.5: "TZID=America/New_York:20071104T013000 indicates November 4, 2007 at
		// 1:30 A.M. EDT (UTC-04:00)"
		expect(wallToInstant('2007-11-04', '01:30', 'America/New_York').toISOString()).toBe(
			'2007-11-04T05:30:00.000Z'
		);
	});

	it('reads a skipped local time with the offset from before the gap', () => {
		// RFC 5545 §3.3.5: "TZID=America/New_York:20070311T023000 indicates March 11, 2007 at
		// 3:30 A.M. EDT (UTC-04:00)"
		expect(wallToInstant('2007-03-11', '02:30', 'America/New_York').toISOString()).toBe(
			'2007-03-11T07:30:00.000Z'
		);
	});

	it('handles the London gap the same way', () => {
		// Europe/London: BST starts last Sunday of March at 01:00 GMT (Summer Time Order / EU
		// directive 2000/84/EC); 29 Mar 2026 01:30 does not exist and reads as 01:30 GMT = 02:30 BST.
		expect(wallToInstant('2026-03-29', '01:30', 'Europe/London').toISOString()).toBe(
			'2026-03-29T01:30:00.000Z'
		);
	});
});

describe('dark nights and extra nights', () => {
	const base: SeasonInput = {
		timeZone: 'Europe/London',
		firstNight: '2026-10-02',
		rule: { nightsOfWeek: ['FR', 'SA'], until: '2026-10-17' },
		doorsOpen: '18:30',
		doorsClose: '22:00',
		crewCallMinutesBefore: 120
	};

	it('leaves dark nights out and adds extra nights in date order', () => {
		// 2 Oct 2026 is a Friday (ISO 8601 calendar).
		const nights = expandSeason({
			...base,
			darkNights: ['2026-10-10'],
			extraNights: ['2026-10-15', '2026-10-03']
		});
		expect(nights.map((n) => n.date)).toEqual([
			'2026-10-02',
			'2026-10-03',
			'2026-10-09',
			'2026-10-15',
			'2026-10-16',
			'2026-10-17'
		]);
		expect(nights.filter((n) => n.extra).map((n) => n.date)).toEqual(['2026-10-15']);
	});

	it('a date that is both dark and extra stays dark', () => {
		const nights = expandSeason({
			...base,
			darkNights: ['2026-10-15'],
			extraNights: ['2026-10-15']
		});
		expect(nights.map((n) => n.date)).not.toContain('2026-10-15');
	});

	it('an open-ended rule needs a through date', () => {
		const open = { ...base, rule: 'FREQ=WEEKLY;BYDAY=FR' };
		expect(() => expandSeason(open)).toThrow(/needs an end/);
		expect(expandSeason(open, { through: '2026-10-16' }).map((n) => n.date)).toEqual([
			'2026-10-02',
			'2026-10-09',
			'2026-10-16'
		]);
	});

	it('refuses a runaway rule', () => {
		const daily = { ...base, rule: 'FREQ=DAILY;COUNT=500' };
		expect(() => expandSeason(daily, { maxNights: 100 })).toThrow(/more than 100 nights/);
	});

	it('the simple shape and its RRULE text give the same nights', () => {
		const text = buildRule(base.rule as Exclude<SeasonInput['rule'], string>);
		expect(expandSeason({ ...base, rule: text })).toEqual(expandSeason(base));
	});
});

describe('rule text checks', () => {
	const cases: [string, RegExp][] = [
		['', /empty/],
		['every friday', /NAME=VALUE/],
		['BYDAY=FR', /needs FREQ/],
		['FREQ=HOURLY;COUNT=3', /DAILY, WEEKLY, MONTHLY or YEARLY/],
		['FREQ=FORTNIGHTLY', /DAILY, WEEKLY/],
		['FREQ=DAILY;BYHOUR=19;COUNT=3', /doors open/],
		['FREQ=WEEKLY;BYDAY=FRI;COUNT=3', /'FRI' is not one/],
		['FREQ=WEEKLY;BYDAY=FR;COUNT=3;UNTIL=20271031', /not both/],
		['FREQ=WEEKLY;INTERVAL=0;COUNT=3', /INTERVAL must be a whole number/],
		['FREQ=WEEKLY;COUNT=3;COUNT=4', /COUNT appears twice/],
		['FREQ=WEEKLY;UNTIL=20270230', /UNTIL must be a date/],
		['FREQ=MONTHLY;BYMONTH=13;COUNT=2', /BYMONTH takes a month number/],
		['FREQ=WEEKLY;COLOR=RED', /COLOR is not part/],
		['DTSTART:20260101\nRRULE:FREQ=DAILY', /one RRULE line/]
	];
	for (const [text, message] of cases) {
		it(`rejects '${text.replace(/\n/g, '\\n')}' with a plain message`, () => {
			expect(() => parseSeasonRule(text)).toThrow(SeasonRuleError);
			expect(() => parseSeasonRule(text)).toThrow(message);
		});
	}

	it('rejects an unknown time zone and a bad date before expanding', () => {
		expect(() =>
			expandSeason({ ...newYork('1997-09-02', 'FREQ=DAILY;COUNT=1'), timeZone: 'Mars/Olympus' })
		).toThrow(/Unknown time zone/);
		expect(() => expandSeason(newYork('1997-02-30', 'FREQ=DAILY;COUNT=1'))).toThrow(/not a date/);
	});
});

describe('buildRule, ruleToParts and describeRule', () => {
	it('writes the simple shape as RRULE text and reads it back', () => {
		const parts = { nightsOfWeek: ['SA' as const, 'FR' as const], until: '2027-10-31' };
		expect(buildRule(parts)).toBe('FREQ=WEEKLY;BYDAY=FR,SA;UNTIL=20271031');
		expect(ruleToParts(buildRule(parts))).toEqual({
			nightsOfWeek: ['FR', 'SA'],
			until: '2027-10-31'
		});
		const fortnightly = { nightsOfWeek: ['TH' as const], everyNWeeks: 2, count: 6 };
		expect(buildRule(fortnightly)).toBe('FREQ=WEEKLY;INTERVAL=2;BYDAY=TH;COUNT=6');
		expect(ruleToParts(buildRule(fortnightly))).toEqual(fortnightly);
	});

	it('says when a rule does not fit the simple shape', () => {
		expect(ruleToParts('FREQ=MONTHLY;COUNT=10;BYDAY=1FR')).toBeNull();
		expect(ruleToParts('FREQ=WEEKLY;UNTIL=19971224T000000Z;BYDAY=MO')).toBeNull();
		expect(ruleToParts('FREQ=DAILY;COUNT=3')).toEqual({
			nightsOfWeek: ['MO', 'TU', 'WE', 'TH', 'FR', 'SA', 'SU'],
			count: 3
		});
	});

	it('summarises in plain words', () => {
		expect(describeRule({ nightsOfWeek: ['SA', 'FR'], until: '2027-10-31' })).toBe(
			'Fridays and Saturdays until 31 Oct 2027'
		);
		expect(describeRule('FREQ=WEEKLY;INTERVAL=2;BYDAY=MO,WE,FR;COUNT=8')).toBe(
			'Mondays, Wednesdays and Fridays every 2 weeks for 8 nights'
		);
		expect(describeRule('FREQ=DAILY;UNTIL=20261101')).toBe('Every night until 1 Nov 2026');
		expect(describeRule({ nightsOfWeek: ['SU'], count: 1 })).toBe('Sundays for 1 night');
		expect(describeRule('FREQ=MONTHLY;COUNT=10;BYDAY=1FR')).toMatch(
			/^Every month on the 1st Friday/
		);
	});

	it('rejects a simple shape with no nights', () => {
		expect(() => buildRule({ nightsOfWeek: [], count: 3 })).toThrow(/at least one night/);
	});
});
