import { describe, expect, it } from 'vitest';
import ICAL from 'ical.js';
import { offsetChanges, zoneOffsetMinutes, zonedEventCalendar, zonedStamp } from './ics';

/** Parse with ical.js (the reference library here) and read the event's start and end as instants. */
function readBack(ics: string) {
	const cal = new ICAL.Component(ICAL.parse(ics));
	const vtz = cal.getFirstSubcomponent('vtimezone')!;
	ICAL.TimezoneService.register(new ICAL.Timezone(vtz));
	const vevent = cal.getFirstSubcomponent('vevent')!;
	const event = new ICAL.Event(vevent);
	return {
		event,
		vevent,
		start: event.startDate.toJSDate(),
		end: event.endDate.toJSDate(),
		tzid: vevent.getFirstProperty('dtstart')!.getParameter('tzid')
	};
}

const base = {
	uid: 'run-sheet-show-1-person-1@gloaming.test',
	summary: 'Crew call: Room tech, Lantern Walk, Hollow Pines Trail',
	sequence: 3
};

describe('zone offsets from the platform time-zone data', () => {
	it('reads standard and daylight offsets', () => {
		// US Eastern: UTC-5 in winter, UTC-4 in summer (Energy Policy Act of 2005 rules).
		expect(zoneOffsetMinutes('America/New_York', new Date('2027-01-15T12:00:00Z'))).toBe(-300);
		expect(zoneOffsetMinutes('America/New_York', new Date('2027-07-15T12:00:00Z'))).toBe(-240);
		expect(zoneOffsetMinutes('Asia/Kolkata', new Date('2027-07-15T12:00:00Z'))).toBe(330);
		expect(zoneOffsetMinutes('UTC', new Date('2027-07-15T12:00:00Z'))).toBe(0);
	});

	it('finds the change to the minute', () => {
		// US DST 2027 ends on the first Sunday of November, 7 Nov, at 02:00 EDT = 06:00 UTC.
		const found = offsetChanges(
			'America/New_York',
			new Date('2027-10-01T00:00:00Z'),
			new Date('2027-12-01T00:00:00Z')
		);
		expect(found).toEqual([{ at: new Date('2027-11-07T06:00:00Z'), from: -240, to: -300 }]);
		// EU summer time 2027 starts on the last Sunday of March, 28 Mar, at 01:00 UTC (Directive 2000/84/EC).
		const london = offsetChanges(
			'Europe/London',
			new Date('2027-03-01T00:00:00Z'),
			new Date('2027-04-01T00:00:00Z')
		);
		expect(london).toEqual([{ at: new Date('2027-03-28T01:00:00Z'), from: 0, to: 60 }]);
	});
});

describe('crew-call calendar file in the venue zone', () => {
	const start = new Date('2027-10-08T21:15:00Z'); // 17:15 EDT
	const end = new Date('2027-10-09T03:00:00Z'); // 23:00 EDT
	const ics = zonedEventCalendar(
		{ ...base, start, end, timeZone: 'America/New_York', location: 'Orchard Lane' },
		new Date('2027-10-01T12:00:00Z')
	);

	it('writes DTSTART as wall-clock time with its TZID (RFC 5545 §3.3.5 form 3)', () => {
		expect(ics).toContain('DTSTART;TZID=America/New_York:20271008T171500\r\n');
		expect(ics).toContain('DTEND;TZID=America/New_York:20271008T230000\r\n');
		expect(ics).toContain('BEGIN:VTIMEZONE\r\nTZID:America/New_York\r\n');
		expect(ics).toContain('SEQUENCE:3\r\n');
		expect(ics.endsWith('END:VCALENDAR\r\n')).toBe(true);
	});

	it('parses back with ical.js to the same instants, UID and SEQUENCE', () => {
		const back = readBack(ics);
		expect(back.tzid).toBe('America/New_York');
		expect(back.start.getTime()).toBe(start.getTime());
		expect(back.end.getTime()).toBe(end.getTime());
		expect(back.event.uid).toBe(base.uid);
		expect(back.event.sequence).toBe(3);
		expect(back.event.location).toBe('Orchard Lane');
	});

	it('places calls on either side of a clock change right', () => {
		// After US DST ends (7 Nov 2027) 17:15 is EST, UTC-5; before it starts (14 Mar) too.
		for (const iso of ['2027-11-12T22:15:00Z', '2027-03-05T22:15:00Z', '2027-06-05T21:15:00Z']) {
			const at = new Date(iso);
			const file = zonedEventCalendar(
				{
					...base,
					start: at,
					end: new Date(at.getTime() + 3_600_000),
					timeZone: 'America/New_York'
				},
				at
			);
			expect(file).toContain(
				`DTSTART;TZID=America/New_York:${iso.slice(0, 10).replace(/-/g, '')}T171500`
			);
			expect(readBack(file).start.getTime()).toBe(at.getTime());
		}
	});

	it('handles a zone without clock changes and one east of UTC', () => {
		for (const [tz, iso, wall] of [
			['Asia/Kolkata', '2027-10-08T11:45:00Z', '20271008T171500'],
			['Europe/London', '2027-10-08T16:15:00Z', '20271008T171500'],
			['Australia/Sydney', '2027-10-08T06:15:00Z', '20271008T171500']
		]) {
			const at = new Date(iso);
			expect(zonedStamp(at, tz)).toBe(wall);
			const file = zonedEventCalendar(
				{ ...base, start: at, end: new Date(at.getTime() + 3_600_000), timeZone: tz },
				at
			);
			expect(readBack(file).start.getTime()).toBe(at.getTime());
		}
	});

	it('refuses an event without a UID or that ends before it starts', () => {
		expect(() => zonedEventCalendar({ ...base, uid: '', start, end, timeZone: 'UTC' })).toThrow(
			/UID/
		);
		expect(() => zonedEventCalendar({ ...base, start: end, end: start, timeZone: 'UTC' })).toThrow(
			/after it starts/
		);
	});
});
