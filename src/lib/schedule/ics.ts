import { localDayOf, localTime, zonePlace, type Clock } from '../util/when';

/** One calendar entry: a show, or one person's part in a show. */
export interface CalendarEvent {
	/** Stable across feeds and updates, such as 'show-42@gloaming.app'. */
	uid: string;
	start: Date;
	end: Date;
	summary: string;
	location?: string | null;
	description?: string | null;
	cancelled?: boolean;
	/** Raise it whenever the event changes so calendars replace their copy. */
	sequence?: number;
	url?: string | null;
}

export interface CalendarOptions {
	/** Calendar name shown by calendar programs (RFC 7986 NAME). */
	name?: string;
	/** When the feed was made; becomes every DTSTAMP. */
	stamp?: Date;
}

/**
 * The words of an event's description: the night's times in the venue's zone and clock, then the
 * show's notes. 'Fri 1 Oct 2027: crew call 6:30 pm, doors 7:30 pm–11:00 pm (New York time).'
 */
export function showTimesText(
	t: { crewCall: Date; doorsOpen: Date; doorsClose: Date; notes?: string | null },
	timeZone: string,
	clock: Clock
): string {
	const at = (d: Date) => localTime(d, timeZone, clock);
	const line =
		`${localDayOf(t.doorsOpen, timeZone)}: crew call ${at(t.crewCall)}, ` +
		`doors ${at(t.doorsOpen)}–${at(t.doorsClose)} (${zonePlace(timeZone)} time).`;
	return t.notes ? `${line}\n\n${t.notes}` : line;
}

export const PRODUCT_ID = '-//Gloaming//Schedule//EN';
const CRLF = '\r\n';
const MAX_OCTETS = 75;
const encoder = new TextEncoder();

/** RFC 5545 §3.3.5 UTC form, such as 19970714T173000Z. */
export function formatUtc(date: Date): string {
	if (Number.isNaN(date.getTime())) throw new RangeError('Not a valid date.');
	return date
		.toISOString()
		.replace(/[-:]/g, '')
		.replace(/\.\d{3}/, '');
}

/** RFC 5545 §3.3.11 TEXT escaping: backslash, semicolon, comma and line breaks. */
export function escapeText(text: string): string {
	return (
		text
			.replace(/\\/g, '\\\\')
			.replace(/;/g, '\\;')
			.replace(/,/g, '\\,')
			.replace(/\r\n|\r|\n/g, '\\n')
			// Other control characters are not allowed in TEXT.
			// eslint-disable-next-line no-control-regex
			.replace(/[\u0000-\u0008\u000b-\u001f\u007f]/g, '')
	);
}

/**
 * Folds one content line to at most 75 octets per line (RFC 5545 §3.1): CRLF then a space, the
 * space counting towards the next line. Octets are UTF-8 bytes; a character is never split.
 */
export function foldLine(line: string): string {
	const lines: string[] = [];
	let current = '';
	let octets = 0;
	for (const char of line) {
		const size = encoder.encode(char).length;
		if (octets + size > MAX_OCTETS) {
			lines.push(current);
			current = ' ';
			octets = 1;
		}
		current += char;
		octets += size;
	}
	lines.push(current);
	return lines.join(CRLF);
}

/** Undoes folding: a line break followed by one space or tab is removed (RFC 5545 §3.1). */
export function unfold(text: string): string {
	return text.replace(/\r?\n[ \t]/g, '');
}

function eventLines(event: CalendarEvent, stamp: string): string[] {
	if (!event.uid) throw new RangeError('Every event needs a UID.');
	if (!(event.end.getTime() > event.start.getTime())) {
		throw new RangeError(`Event ${event.uid} must end after it starts.`);
	}
	const lines = [
		'BEGIN:VEVENT',
		`UID:${escapeText(event.uid)}`,
		`DTSTAMP:${stamp}`,
		`DTSTART:${formatUtc(event.start)}`,
		`DTEND:${formatUtc(event.end)}`,
		`SUMMARY:${escapeText(event.summary)}`
	];
	if (event.location) lines.push(`LOCATION:${escapeText(event.location)}`);
	if (event.description) lines.push(`DESCRIPTION:${escapeText(event.description)}`);
	if (event.url) lines.push(`URL:${event.url}`);
	lines.push(`STATUS:${event.cancelled ? 'CANCELLED' : 'CONFIRMED'}`);
	if (event.sequence !== undefined) lines.push(`SEQUENCE:${event.sequence}`);
	lines.push('END:VEVENT');
	return lines;
}

/** An RFC 5545 calendar (text/calendar) with one VEVENT per event, times in UTC. */
export function buildCalendar(events: CalendarEvent[], options: CalendarOptions = {}): string {
	const stamp = formatUtc(options.stamp ?? new Date());
	const lines = [
		'BEGIN:VCALENDAR',
		'VERSION:2.0',
		`PRODID:${PRODUCT_ID}`,
		'CALSCALE:GREGORIAN',
		'METHOD:PUBLISH'
	];
	if (options.name) lines.push(`NAME:${escapeText(options.name)}`);
	for (const event of events) lines.push(...eventLines(event, stamp));
	lines.push('END:VCALENDAR');
	return lines.map(foldLine).join(CRLF) + CRLF;
}
