import ICAL from 'ical.js';
import { describe, expect, it } from 'vitest';
import { buildCalendar, PRODUCT_ID, type CalendarEvent } from './ics';

const stamp = new Date('2026-09-01T12:00:00Z');
const octets = (line: string) => new TextEncoder().encode(line).length;
const physicalLines = (ics: string) => ics.split('\r\n').slice(0, -1);
/** Undoes folding: a line break followed by one space or tab is removed (RFC 5545 §3.1). */
const unfold = (text: string) => text.replace(/\r?\n[ \t]/g, '');

const show: CalendarEvent = {
	uid: 'show-1@gloaming.app',
	start: new Date('2026-10-30T23:00:00Z'),
	end: new Date('2026-10-31T03:00:00Z'),
	summary: 'Hollow Pines: doors 19:00',
	location: 'Barn 2, Hollow Lane; Gate B',
	description: 'Crew call 17:00.\nBring a torch, gloves; and a C:\\ path.\nRoom: Ünterhölle 🎃'
};

/** The physical lines of one event's DESCRIPTION, from its first line to the next property. */
function descriptionLines(description: string): string[] {
	const lines = physicalLines(buildCalendar([{ ...show, description }], { stamp }));
	const from = lines.findIndex((l) => l.startsWith('DESCRIPTION:'));
	const to = lines.findIndex((l, i) => i > from && !l.startsWith(' '));
	return lines.slice(from, to);
}

describe('TEXT values', () => {
	it('escapes backslash, semicolon, comma and line breaks', () => {
		// RFC 5545 §3.3.11: ESCAPED-CHAR = "\\" / "\;" / "\," / "\N" / "\n"
		expect(unfold(descriptionLines('a\\b;c,d\ne\r\nf').join('\r\n'))).toBe(
			'DESCRIPTION:a\\\\b\\;c\\,d\\ne\\nf'
		);
	});

	it('matches the RFC example description', () => {
		// RFC 5545 §3.3.11 example: DESCRIPTION:Project XYZ Final Review\nConference Room - 3B\nCome Prepared.
		expect(
			unfold(
				descriptionLines('Project XYZ Final Review\nConference Room - 3B\nCome Prepared.').join(
					'\r\n'
				)
			)
		).toBe('DESCRIPTION:Project XYZ Final Review\\nConference Room - 3B\\nCome Prepared.');
	});

	it('drops control characters that TEXT does not allow', () => {
		// RFC 5545 §3.3.11: TSAFE-CHAR excludes CONTROL characters other than HTAB.
		expect(descriptionLines('bell\u0007 and\u001b escape')).toEqual([
			'DESCRIPTION:bell and escape'
		]);
	});
});

describe('UTC times', () => {
	it('writes the UTC form with a trailing Z', () => {
		// RFC 5545 §3.3.5 FORM #2 example: 19980119T070000Z
		const ics = buildCalendar(
			[
				{
					...show,
					start: new Date('1998-01-19T07:00:00Z'),
					end: new Date('1998-01-19T08:00:00Z')
				}
			],
			{ stamp }
		);
		expect(ics).toContain('\r\nDTSTART:19980119T070000Z\r\n');
	});
});

describe('folding', () => {
	it('folds ASCII within 75 octets with CRLF and a space', () => {
		// RFC 5545 §3.1: lines SHOULD NOT be longer than 75 octets, excluding the line break; the
		// leading space of a continuation counts, so 212 octets need three lines.
		const folded = descriptionLines('x'.repeat(200));
		expect(folded).toHaveLength(3);
		for (const l of folded) expect(octets(l)).toBeLessThanOrEqual(75);
		expect(folded.slice(1).every((l) => l.startsWith(' '))).toBe(true);
		expect(unfold(folded.join('\r\n'))).toBe(`DESCRIPTION:${'x'.repeat(200)}`);
	});

	it('never splits a multi-octet UTF-8 character', () => {
		// RFC 5545 §3.1: "a multi-octet sequence MUST NOT be split across lines"; a pumpkin emoji is
		// 4 octets in UTF-8 (RFC 3629).
		const folded = descriptionLines(`a${'🎃'.repeat(40)}ü`);
		expect(folded.length).toBeGreaterThan(2);
		const decoder = new TextDecoder('utf-8', { fatal: true });
		for (const l of folded) {
			expect(octets(l)).toBeLessThanOrEqual(75);
			expect(() => decoder.decode(new TextEncoder().encode(l))).not.toThrow();
			expect(l).not.toMatch(/[\uD800-\uDBFF]$/);
		}
		expect(unfold(folded.join('\r\n'))).toBe(`DESCRIPTION:a${'🎃'.repeat(40)}ü`);
	});

	it('unfolds the RFC example', () => {
		// RFC 5545 §3.1 example of a folded DESCRIPTION line (checks this file's unfold helper).
		expect(
			unfold('DESCRIPTION:This is a lo\r\n ng description\r\n  that exists on a long line.')
		).toBe('DESCRIPTION:This is a long description that exists on a long line.');
	});
});

describe('buildCalendar', () => {
	const ics = buildCalendar(
		[show, { ...show, uid: 'show-2@gloaming.app', cancelled: true, sequence: 1 }],
		{ name: 'Hollow Pines, crew', stamp }
	);
	const lines = unfold(ics).split('\r\n').slice(0, -1);

	it('has the calendar and event structure RFC 5545 requires', () => {
		// RFC 5545 §3.6: VCALENDAR needs PRODID and VERSION:2.0; §3.6.1: VEVENT needs UID and DTSTAMP,
		// and DTEND and DURATION never appear together; §3.8.7.2: DTSTAMP in UTC.
		expect(lines[0]).toBe('BEGIN:VCALENDAR');
		expect(lines.at(-1)).toBe('END:VCALENDAR');
		expect(lines).toContain('VERSION:2.0');
		expect(lines).toContain(`PRODID:${PRODUCT_ID}`);
		const events = unfold(ics).split('BEGIN:VEVENT').slice(1);
		expect(events).toHaveLength(2);
		for (const event of events) {
			expect(event).toMatch(/\r\nUID:[^\r]+\r\n/);
			expect(event).toMatch(/\r\nDTSTAMP:20260901T120000Z\r\n/);
			expect(event).toMatch(/\r\nDTSTART:20261030T230000Z\r\n/);
			expect(event).toMatch(/\r\nDTEND:20261031T030000Z\r\n/);
			expect(event).not.toMatch(/\r\nDURATION:/);
		}
		expect(events[1]).toMatch(/\r\nSTATUS:CANCELLED\r\n/);
		expect(events[0]).toMatch(/\r\nSTATUS:CONFIRMED\r\n/);
	});

	it('ends every line in CRLF and keeps every line within 75 octets', () => {
		// RFC 5545 §3.1: content lines are delimited by CRLF and folded at 75 octets.
		expect(ics.endsWith('\r\n')).toBe(true);
		expect(ics.replace(/\r\n/g, '')).not.toMatch(/[\r\n]/);
		for (const line of physicalLines(ics)) expect(octets(line)).toBeLessThanOrEqual(75);
		expect(physicalLines(ics).length).toBeGreaterThan(lines.length);
	});

	it('reads back through a general-purpose ICS parser with the same values', () => {
		// Parsed with ical.js, an independent RFC 5545 parser.
		const calendar = new ICAL.Component(ICAL.parse(ics));
		expect(calendar.getFirstPropertyValue('prodid')).toBe(PRODUCT_ID);
		const [first, second] = calendar.getAllSubcomponents('vevent');
		const event = new ICAL.Event(first);
		expect(event.uid).toBe('show-1@gloaming.app');
		expect(event.summary).toBe(show.summary);
		expect(event.location).toBe(show.location);
		expect(event.description).toBe(show.description);
		expect(event.startDate.toJSDate().toISOString()).toBe('2026-10-30T23:00:00.000Z');
		expect(event.endDate.toJSDate().toISOString()).toBe('2026-10-31T03:00:00.000Z');
		expect(second.getFirstPropertyValue('status')).toBe('CANCELLED');
		expect(second.getFirstPropertyValue('sequence')).toBe(1);
	});

	it('escapes the calendar name (RFC 7986 NAME is TEXT)', () => {
		expect(lines).toContain('NAME:Hollow Pines\\, crew');
		const calendar = new ICAL.Component(ICAL.parse(ics));
		expect(calendar.getFirstPropertyValue('name')).toBe('Hollow Pines, crew');
	});

	it('refuses an event that ends before it starts', () => {
		expect(() => buildCalendar([{ ...show, end: show.start }], { stamp })).toThrow(/end after/);
	});
});
