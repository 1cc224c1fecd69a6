import { describe, expect, it } from 'vitest';
import { dateIn, offsetText, wallText, wallToInstant } from './wall-time';

describe('venue wall time for the calendar', () => {
	it('shows an instant on the venue clock whatever zone the code runs in', () => {
		// US Eastern daylight time (UTC-4) until the first Sunday of November 2027 (15 U.S.C. 260a).
		expect(wallText('2027-10-01T23:00:00Z', 'America/New_York')).toBe('2027-10-01T19:00:00');
		// After it, standard time (UTC-5): 19:00 local is 00:00 UTC the next day.
		expect(wallText('2027-11-13T00:00:00Z', 'America/New_York')).toBe('2027-11-12T19:00:00');
		// Round trip with the season maths.
		const doors = wallToInstant('2027-11-12', '19:00', 'America/New_York');
		expect(wallText(doors, 'America/New_York')).toBe('2027-11-12T19:00:00');
	});

	it('gives the offset and the date the venue is living in', () => {
		// UK: BST (UTC+1) in summer, GMT in winter (The Summer Time Order 2002).
		expect(offsetText('Europe/London', new Date('2027-07-01T12:00:00Z'))).toBe('+01:00');
		expect(offsetText('Europe/London', new Date('2027-12-01T12:00:00Z'))).toBe('+00:00');
		expect(offsetText('America/New_York', new Date('2027-12-01T12:00:00Z'))).toBe('-05:00');
		// IANA tz database: India Standard Time is UTC+05:30 all year
		expect(offsetText('Asia/Kolkata', new Date('2027-12-01T12:00:00Z'))).toBe('+05:30');
		// 02:00 UTC on 2 Oct is still 1 Oct evening in New York.
		expect(dateIn('America/New_York', new Date('2027-10-02T02:00:00Z'))).toBe('2027-10-01');
		expect(dateIn('Pacific/Auckland', new Date('2027-10-02T02:00:00Z'))).toBe('2027-10-02');
	});
});
