import ICAL from 'ical.js';
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

// ical.js writes the files: it escapes TEXT values (RFC 5545 §3.3.11), writes CRLF line breaks and
// folds lines by UTF-8 octets without splitting a character (§3.1). Its fold length counts the text
// after the leading space, so 74 keeps every physical line within 75 octets.
ICAL.foldLength = 74;
// RFC 7986 NAME is TEXT; ical.js does not know it, and would write it unescaped.
ICAL.design.icalendar.property.name ??= { defaultType: 'text' };

/** A calendar's wrapper: VERSION, PRODID, CALSCALE, METHOD, and NAME when given. */
export function newCalendar(name?: string): ICAL.Component {
	const calendar = new ICAL.Component('vcalendar');
	calendar.addPropertyWithValue('version', '2.0');
	calendar.addPropertyWithValue('prodid', PRODUCT_ID);
	calendar.addPropertyWithValue('calscale', 'GREGORIAN');
	calendar.addPropertyWithValue('method', 'PUBLISH');
	if (name) calendar.addPropertyWithValue('name', plainText(name));
	return calendar;
}

/** The text of a calendar file: every line ends in CRLF, the last one too (RFC 5545 §3.1). */
export function calendarText(calendar: ICAL.Component): string {
	return calendar.toString() + '\r\n';
}

/** An instant as a UTC DATE-TIME (RFC 5545 §3.3.5 form 2, such as 19970714T173000Z). */
export function utcTime(date: Date): ICAL.Time {
	if (Number.isNaN(date.getTime())) throw new RangeError('Not a valid date.');
	return ICAL.Time.fromJSDate(date, true);
}

/** Line breaks as one newline, and without the control characters TEXT does not allow (§3.3.11). */
export function plainText(text: string): string {
	// eslint-disable-next-line no-control-regex
	return text.replace(/\r\n|\r/g, '\n').replace(/[\u0000-\u0008\u000b-\u001f\u007f]/g, '');
}

/** The event's checks and its common properties; the caller adds DTSTART and DTEND. */
export function newEvent(
	event: Pick<CalendarEvent, 'uid' | 'start' | 'end'>,
	stamp: Date
): ICAL.Component {
	if (!event.uid) throw new RangeError('Every event needs a UID.');
	if (!(event.end.getTime() > event.start.getTime())) {
		throw new RangeError(`Event ${event.uid} must end after it starts.`);
	}
	const vevent = new ICAL.Component('vevent');
	vevent.addPropertyWithValue('uid', plainText(event.uid));
	vevent.addPropertyWithValue('dtstamp', utcTime(stamp));
	return vevent;
}

/** SUMMARY, LOCATION, DESCRIPTION, URL, STATUS and SEQUENCE, after the times. */
export function addDetails(vevent: ICAL.Component, event: CalendarEvent): void {
	vevent.addPropertyWithValue('summary', plainText(event.summary));
	if (event.location) vevent.addPropertyWithValue('location', plainText(event.location));
	if (event.description) vevent.addPropertyWithValue('description', plainText(event.description));
	if (event.url) vevent.addPropertyWithValue('url', event.url);
	vevent.addPropertyWithValue('status', event.cancelled ? 'CANCELLED' : 'CONFIRMED');
	if (event.sequence !== undefined) vevent.addPropertyWithValue('sequence', event.sequence);
}

/** An RFC 5545 calendar (text/calendar) with one VEVENT per event, times in UTC. */
export function buildCalendar(events: CalendarEvent[], options: CalendarOptions = {}): string {
	const stamp = options.stamp ?? new Date();
	const calendar = newCalendar(options.name);
	for (const event of events) {
		const vevent = newEvent(event, stamp);
		vevent.addPropertyWithValue('dtstart', utcTime(event.start));
		vevent.addPropertyWithValue('dtend', utcTime(event.end));
		addDetails(vevent, event);
		calendar.addSubcomponent(vevent);
	}
	return calendarText(calendar);
}
