import ICAL from 'ical.js';
import { addDetails, calendarText, newCalendar, newEvent } from '../schedule/ics';

const formatters = new Map<string, Intl.DateTimeFormat>();

/** Minutes east of UTC of a zone at an instant, from the platform's time-zone data. */
export function zoneOffsetMinutes(timeZone: string, at: Date): number {
	let f = formatters.get(timeZone);
	if (!f) {
		f = new Intl.DateTimeFormat('en-US', { timeZone, timeZoneName: 'longOffset' });
		formatters.set(timeZone, f);
	}
	const name = f.formatToParts(at).find((p) => p.type === 'timeZoneName')?.value;
	const m = /GMT([+-])(\d{2}):?(\d{2})?/.exec(name ?? '');
	if (!m) return 0; // plain "GMT"
	return (m[1] === '-' ? -1 : 1) * (Number(m[2]) * 60 + Number(m[3] ?? 0));
}

/** RFC 5545 §3.3.14 UTC-OFFSET, such as -0400. */
function utcOffset(minutes: number): ICAL.UtcOffset {
	return ICAL.UtcOffset.fromSeconds(minutes * 60);
}

/** The wall time of an instant at a fixed offset, as a local ("floating") DATE-TIME (§3.3.5). */
function wallTime(at: Date, offsetMinutes: number): ICAL.Time {
	const d = new Date(at.getTime() + offsetMinutes * 60_000);
	return ICAL.Time.fromData({
		year: d.getUTCFullYear(),
		month: d.getUTCMonth() + 1,
		day: d.getUTCDate(),
		hour: d.getUTCHours(),
		minute: d.getUTCMinutes(),
		second: d.getUTCSeconds(),
		isDate: false
	});
}

/** Local wall time of an instant in a zone, as an RFC 5545 DATE-TIME without Z. */
export function zonedStamp(at: Date, timeZone: string): string {
	return wallTime(at, zoneOffsetMinutes(timeZone, at)).toICALString();
}

export interface OffsetChange {
	at: Date;
	from: number;
	to: number;
}

/** Every change of a zone's UTC offset between two instants, to the minute. */
export function offsetChanges(timeZone: string, from: Date, to: Date): OffsetChange[] {
	const changes: OffsetChange[] = [];
	const step = 86_400_000;
	let t = from.getTime();
	let before = zoneOffsetMinutes(timeZone, from);
	while (t < to.getTime()) {
		const next = Math.min(t + step, to.getTime());
		const after = zoneOffsetMinutes(timeZone, new Date(next));
		if (after !== before) {
			// Narrow the day down to the minute where the offset changes.
			let lo = t;
			let hi = next;
			while (hi - lo > 60_000) {
				const mid = lo + Math.floor((hi - lo) / 120_000) * 60_000;
				if (zoneOffsetMinutes(timeZone, new Date(mid)) === before) lo = mid;
				else hi = mid;
			}
			changes.push({ at: new Date(hi), from: before, to: after });
			before = after;
		}
		t = next;
	}
	return changes;
}

function observance(kind: 'standard' | 'daylight', start: ICAL.Time, from: number, to: number) {
	const c = new ICAL.Component(kind);
	c.addPropertyWithValue('dtstart', start);
	c.addPropertyWithValue('tzoffsetfrom', utcOffset(from));
	c.addPropertyWithValue('tzoffsetto', utcOffset(to));
	return c;
}

/**
 * An RFC 5545 §3.6.5 VTIMEZONE for a zone, with one observance per offset change from the start of
 * the year before `at` to the end of its year, so every instant near `at` is covered.
 */
export function vtimezone(timeZone: string, at: Date): ICAL.Component {
	const year = at.getUTCFullYear();
	const from = new Date(Date.UTC(year - 1, 0, 1));
	const to = new Date(Date.UTC(year + 1, 0, 1));
	const changes = offsetChanges(timeZone, from, to);
	const epoch = ICAL.Time.fromData({ year: 1970, month: 1, day: 1, isDate: false });
	const vtz = new ICAL.Component('vtimezone');
	vtz.addPropertyWithValue('tzid', timeZone);
	// The offset in force before the first change (or always, in a zone without changes).
	const first = changes[0]?.from ?? zoneOffsetMinutes(timeZone, at);
	vtz.addSubcomponent(observance('standard', epoch, first, first));
	for (const c of changes) {
		// DTSTART is the wall time the change happens at, read in the offset before it.
		const kind = c.to > c.from ? 'daylight' : 'standard';
		vtz.addSubcomponent(observance(kind, wallTime(c.at, c.from), c.from, c.to));
	}
	return vtz;
}

export interface ZonedEvent {
	uid: string;
	start: Date;
	end: Date;
	timeZone: string;
	summary: string;
	location?: string | null;
	description?: string | null;
	url?: string | null;
	sequence: number;
	cancelled?: boolean;
}

/**
 * A calendar file with one event at wall-clock times in the venue's zone (DTSTART;TZID=…), the
 * zone described in a VTIMEZONE so calendar programs place it right (RFC 5545 §3.2.19, §3.6.5).
 */
export function zonedEventCalendar(event: ZonedEvent, stamp = new Date()): string {
	const tz = event.timeZone;
	const vevent = newEvent(event, stamp);
	for (const [name, at] of [
		['dtstart', event.start],
		['dtend', event.end]
	] as const) {
		const prop = new ICAL.Property(name);
		prop.setParameter('tzid', tz);
		prop.setValue(wallTime(at, zoneOffsetMinutes(tz, at)));
		vevent.addProperty(prop);
	}
	addDetails(vevent, event);
	const calendar = newCalendar();
	calendar.addSubcomponent(vtimezone(tz, event.start));
	calendar.addSubcomponent(vevent);
	return calendarText(calendar);
}
