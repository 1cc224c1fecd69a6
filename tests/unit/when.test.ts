import { describe, expect, it } from 'vitest';
import { addMinutes, format } from 'date-fns';
import { formatInTimeZone } from 'date-fns-tz';
import {
	clockTime,
	localDateTime,
	localTime,
	timeValue,
	typedDateTime,
	wallDay,
	wallWeek
} from '$lib/util/when';

// date-fns 4 `format` is the reference for both clocks: 'HH:mm' (24-hour) and 'h:mm aaa'
// (12-hour, lower-case am/pm, no leading zero: '7:05 pm', '12:00 pm' at noon, '12:00 am' at midnight).
const minutesOfADay = Array.from({ length: 24 * 60 }, (_, i) => i);

describe('the venue clock', () => {
	it('writes every stored local HH:MM of a day as date-fns does', () => {
		for (const i of minutesOfADay) {
			const d = new Date(2027, 9, 1, Math.floor(i / 60), i % 60);
			const hhmm = format(d, 'HH:mm');
			expect(clockTime(hhmm, '24h')).toBe(format(d, 'HH:mm'));
			expect(clockTime(hhmm, '12h')).toBe(format(d, 'h:mm aaa'));
		}
	});

	it('writes every instant of a day in the venue zone as date-fns-tz does', () => {
		// date-fns-tz formatInTimeZone: date-fns format applied to the zone's wall time.
		const start = new Date('2027-11-07T04:00:00Z'); // New York's day the clocks go back
		for (const zone of ['America/New_York', 'Australia/Adelaide']) {
			for (const i of minutesOfADay) {
				const at = addMinutes(start, i);
				expect(localTime(at, zone, '24h')).toBe(formatInTimeZone(at, zone, 'HH:mm'));
				expect(localTime(at, zone, '12h')).toBe(formatInTimeZone(at, zone, 'h:mm aaa'));
			}
		}
	});

	it('names noon, midnight and an evening time on the 12-hour clock', () => {
		// common practice, no published source: noon is 12 pm and midnight 12 am
		expect(clockTime('12:00', '12h')).toBe('12:00 pm');
		expect(clockTime('00:00', '12h')).toBe('12:00 am');
		expect(clockTime('19:05', '12h')).toBe('7:05 pm');
		expect(clockTime('19:05', '24h')).toBe('19:05');
		expect(localDateTime('2027-10-01T23:30:00Z', 'America/New_York', '12h')).toBe(
			'Fri 1 Oct 2027, 7:30 pm'
		);
	});

	it('gives time inputs HH:MM and echoes what was typed in the venue words', () => {
		expect(timeValue('7:05')).toBe('07:05');
		expect(timeValue('19:30:00')).toBe('19:30');
		// 3 October 2027 is a Sunday (ISO 8601 calendar; date-fns agrees)
		expect(format(new Date(2027, 9, 3), 'EEE')).toBe('Sun');
		expect(typedDateTime('2027-10-03', '19:30', '12h')).toBe('Sun 3 Oct 2027, 7:30 pm');
		expect(typedDateTime('2027-10-03', '', '24h')).toBe('Sun 3 Oct 2027');
		expect(typedDateTime('', '', '24h')).toBe('');
	});
});

describe('calendar headings', () => {
	it('write every day of two years the way date-fns writes EEE d MMM', () => {
		// date-fns format tokens, en-US default locale: 'EEE d MMM' → 'Fri 1 Oct'.
		for (let d = new Date(2027, 0, 1); d.getFullYear() < 2029; d = new Date(d.getTime() + 864e5)) {
			const day = new Date(d.getFullYear(), d.getMonth(), d.getDate());
			expect(wallDay(day)).toBe(format(day, 'EEE d MMM'));
			expect(wallDay(day, true)).toBe(format(day, 'EEE d MMM yyyy'));
		}
	});

	it('title a week from its first to its last day, the year once unless it changes', () => {
		expect(wallWeek(new Date(2027, 8, 27), new Date(2027, 9, 3))).toBe('27 Sep – 3 Oct 2027');
		expect(wallWeek(new Date(2027, 11, 27), new Date(2028, 0, 2))).toBe('27 Dec 2027 – 2 Jan 2028');
	});
});
