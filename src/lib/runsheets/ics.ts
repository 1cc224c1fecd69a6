import { escapeText, foldLine, formatUtc, PRODUCT_ID } from '../schedule/ics';

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
function utcOffset(minutes: number): string {
	const sign = minutes < 0 ? '-' : '+';
	const abs = Math.abs(minutes);
	return `${sign}${String(Math.floor(abs / 60)).padStart(2, '0')}${String(abs % 60).padStart(2, '0')}`;
}

/** RFC 5545 §3.3.5 local ("floating") date-time of an instant at a fixed offset: 19980118T230000. */
function localStamp(at: Date, offsetMinutes: number): string {
	return formatUtc(new Date(at.getTime() + offsetMinutes * 60_000)).replace('Z', '');
}

/** Local wall time of an instant in a zone, as an RFC 5545 DATE-TIME without Z. */
export function zonedStamp(at: Date, timeZone: string): string {
	return localStamp(at, zoneOffsetMinutes(timeZone, at));
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

/**
 * An RFC 5545 §3.6.5 VTIMEZONE for a zone, with one observance per offset change from the start of
 * the year before `at` to the end of its year, so every instant near `at` is covered.
 */
export function vtimezoneLines(timeZone: string, at: Date): string[] {
	const year = at.getUTCFullYear();
	const from = new Date(Date.UTC(year - 1, 0, 1));
	const to = new Date(Date.UTC(year + 1, 0, 1));
	const changes = offsetChanges(timeZone, from, to);
	const lines = ['BEGIN:VTIMEZONE', `TZID:${timeZone}`];
	if (changes.length === 0) {
		const off = utcOffset(zoneOffsetMinutes(timeZone, at));
		lines.push(
			'BEGIN:STANDARD',
			'DTSTART:19700101T000000',
			`TZOFFSETFROM:${off}`,
			`TZOFFSETTO:${off}`,
			'END:STANDARD'
		);
	} else {
		// The offset in force before the first change, from the start of the range.
		const first = changes[0];
		lines.push(
			'BEGIN:STANDARD',
			'DTSTART:19700101T000000',
			`TZOFFSETFROM:${utcOffset(first.from)}`,
			`TZOFFSETTO:${utcOffset(first.from)}`,
			'END:STANDARD'
		);
		for (const c of changes) {
			const kind = c.to > c.from ? 'DAYLIGHT' : 'STANDARD';
			lines.push(
				`BEGIN:${kind}`,
				// DTSTART is the wall time the change happens at, read in the offset before it.
				`DTSTART:${localStamp(c.at, c.from)}`,
				`TZOFFSETFROM:${utcOffset(c.from)}`,
				`TZOFFSETTO:${utcOffset(c.to)}`,
				`END:${kind}`
			);
		}
	}
	lines.push('END:VTIMEZONE');
	return lines;
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
	if (!event.uid) throw new RangeError('Every event needs a UID.');
	if (!(event.end.getTime() > event.start.getTime()))
		throw new RangeError(`Event ${event.uid} must end after it starts.`);
	const tz = event.timeZone;
	const lines = [
		'BEGIN:VCALENDAR',
		'VERSION:2.0',
		`PRODID:${PRODUCT_ID}`,
		'CALSCALE:GREGORIAN',
		'METHOD:PUBLISH',
		...vtimezoneLines(tz, event.start),
		'BEGIN:VEVENT',
		`UID:${escapeText(event.uid)}`,
		`DTSTAMP:${formatUtc(stamp)}`,
		`DTSTART;TZID=${tz}:${zonedStamp(event.start, tz)}`,
		`DTEND;TZID=${tz}:${zonedStamp(event.end, tz)}`,
		`SUMMARY:${escapeText(event.summary)}`
	];
	if (event.location) lines.push(`LOCATION:${escapeText(event.location)}`);
	if (event.description) lines.push(`DESCRIPTION:${escapeText(event.description)}`);
	if (event.url) lines.push(`URL:${event.url}`);
	lines.push(
		`STATUS:${event.cancelled ? 'CANCELLED' : 'CONFIRMED'}`,
		`SEQUENCE:${event.sequence}`,
		'END:VEVENT',
		'END:VCALENDAR'
	);
	return lines.map(foldLine).join('\r\n') + '\r\n';
}
