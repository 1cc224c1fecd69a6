import { describe, expect, it } from 'vitest';
import { formatInTimeZone } from 'date-fns-tz';
import { localDate, localDateTime, localDay, localDayOf, localTime, zonePlace } from './when';

// date-fns-tz, a general-purpose time-zone library from npm, is the reference for each instant.
const instants = [
	'2027-10-01T01:41:00Z', // evening of 30 September in New York (EDT, UTC-4)
	'2027-11-07T05:30:00Z', // 01:30 after New York's clocks go back (EST, UTC-5)
	'2027-03-28T00:59:00Z', // a minute before London's clocks go forward
	'2027-12-31T23:59:00Z'
];
const zones = ['America/New_York', 'Europe/London', 'Australia/Adelaide', 'UTC'];

describe('one clock in the venue zone', () => {
	for (const zone of zones)
		it(`shows instants as ${zone} does`, () => {
			for (const at of instants) {
				expect(localTime(at, zone, '24h')).toBe(formatInTimeZone(at, zone, 'HH:mm'));
				expect(localDate(at, zone)).toBe(formatInTimeZone(at, zone, 'yyyy-MM-dd'));
				expect(localDayOf(at, zone)).toBe(formatInTimeZone(at, zone, 'EEE d MMM yyyy'));
				expect(localDateTime(at, zone, '24h')).toBe(
					formatInTimeZone(at, zone, 'EEE d MMM yyyy, HH:mm')
				);
			}
		});

	it('names a local date without moving it to another day', () => {
		// 1 October 2027 is a Friday (ISO 8601 calendar; date-fns agrees)
		expect(localDay('2027-10-01')).toBe('Fri 1 Oct 2027');
	});

	it('names a zone by its place', () => {
		expect(zonePlace('America/New_York')).toBe('New York');
		expect(zonePlace('UTC')).toBe('UTC');
	});
});
