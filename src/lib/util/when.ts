// One clock for the whole app: every instant is shown in the venue's time zone, the same way on
// the server and in the browser, as 'Fri 1 Oct 2027' and '21:41', or '9:41 pm' for a venue that
// writes times on the 12-hour clock (a venue setting, 24-hour by default).

/** How a venue writes times: '19:30' or '7:30 pm'. */
export const CLOCKS = ['24h', '12h'] as const;
export type Clock = (typeof CLOCKS)[number];

const HHMM = /^(\d{1,2}):(\d{2})/;

/** 'HH:MM' for a time input from a stored local time ('7:05', '19:05:00' → '07:05', '19:05'). */
export function timeValue(hhmm: string): string {
	const m = HHMM.exec(hhmm.trim());
	if (!m) return hhmm;
	return `${m[1].padStart(2, '0')}:${m[2]}`;
}

/**
 * A stored local 'HH:MM' in the venue's words: '19:05' on the 24-hour clock, '7:05 pm' on the
 * 12-hour clock (noon is '12:00 pm', midnight '12:00 am'). Anything that is not a time is left as it is.
 */
export function clockTime(hhmm: string, clock: Clock): string {
	const m = HHMM.exec(hhmm.trim());
	if (!m) return hhmm;
	const hour = Number(m[1]);
	if (clock !== '12h') return `${String(hour).padStart(2, '0')}:${m[2]}`;
	return `${hour % 12 === 0 ? 12 : hour % 12}:${m[2]} ${hour < 12 ? 'am' : 'pm'}`;
}

const formatters = new Map<string, Intl.DateTimeFormat>();

/** Formatters are costly to build; one per zone and style is kept. */
function formatter(key: string, make: () => Intl.DateTimeFormat): Intl.DateTimeFormat {
	let f = formatters.get(key);
	if (!f) formatters.set(key, (f = make()));
	return f;
}

const TIME = { hour: '2-digit', minute: '2-digit', hourCycle: 'h23' } as const;

/** Wall-clock words for an instant in the venue's time zone: '21:41' or '9:41 pm'. */
export function localTime(at: Date | string, timeZone: string, clock: Clock): string {
	const hhmm = formatter(
		`time ${timeZone}`,
		() => new Intl.DateTimeFormat('en-GB', { timeZone, ...TIME })
	).format(new Date(at));
	return clockTime(hhmm, clock);
}

/**
 * The time held in a Date's own local fields, for components that carry the venue's wall clock
 * as floating times (the calendar): '19:05' or '7:05 pm'.
 */
export function wallClockTime(d: Date, clock: Clock): string {
	const pad = (n: number) => String(n).padStart(2, '0');
	return clockTime(`${pad(d.getHours())}:${pad(d.getMinutes())}`, clock);
}

/** The same with seconds, for readings a board sent: '21:41:07'. */
export function localTimeSeconds(at: Date | string | number, timeZone: string): string {
	return formatter(
		`seconds ${timeZone}`,
		() => new Intl.DateTimeFormat('en-GB', { timeZone, ...TIME, second: '2-digit' })
	).format(new Date(at));
}

const WEEKDAYS = ['Sun', 'Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat'];
// Spelt out here rather than taken from the locale data, which differs between versions
// ('Sep' or 'Sept'), so the server and every browser write the same words.
const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

/** 'Fri 1 Oct 2027' for a local 'YYYY-MM-DD' date. */
export function localDay(date: string): string {
	const [y, m, d] = date.split('-').map(Number);
	const weekday = new Date(Date.UTC(y, m - 1, d)).getUTCDay();
	return `${WEEKDAYS[weekday]} ${d} ${MONTHS[m - 1]} ${y}`;
}

/**
 * A floating date's day as the calendar heads it ('Fri 1 Oct', with the year 'Fri 1 Oct 2027'): the
 * calendar hands over dates whose local fields are already the venue's wall time.
 */
export function wallDay(d: Date, withYear = false): string {
	const day = `${WEEKDAYS[d.getDay()]} ${d.getDate()} ${MONTHS[d.getMonth()]}`;
	return withYear ? `${day} ${d.getFullYear()}` : day;
}

/** A floating range of days as the calendar titles it, last day included: '27 Sep – 3 Oct 2027'. */
export function wallWeek(start: Date, last: Date | null): string {
	const end = last ?? start;
	const first = `${start.getDate()} ${MONTHS[start.getMonth()]}`;
	const year = start.getFullYear() === end.getFullYear() ? '' : ` ${start.getFullYear()}`;
	return `${first}${year} – ${end.getDate()} ${MONTHS[end.getMonth()]} ${end.getFullYear()}`;
}

/** The venue's local date 'YYYY-MM-DD' of an instant. */
export function localDate(at: Date | string, timeZone: string): string {
	return formatter(
		`date ${timeZone}`,
		() =>
			new Intl.DateTimeFormat('en-CA', {
				timeZone,
				year: 'numeric',
				month: '2-digit',
				day: '2-digit'
			})
	).format(new Date(at));
}

/** The day of an instant in the venue's time zone: 'Fri 1 Oct 2027'. */
export function localDayOf(at: Date | string, timeZone: string): string {
	return localDay(localDate(at, timeZone));
}

/** Day and time of an instant in the venue's time zone: 'Fri 1 Oct 2027, 21:41' or '…, 9:41 pm'. */
export function localDateTime(at: Date | string, timeZone: string, clock: Clock): string {
	return `${localDayOf(at, timeZone)}, ${localTime(at, timeZone, clock)}`;
}

/**
 * A local date and time as typed into date and time inputs ('2027-10-03', '19:30') in the venue's
 * words: 'Sun 3 Oct 2027, 7:30 pm'. Either part may be missing; nothing typed gives ''.
 */
export function typedDateTime(date: string, time: string, clock: Clock): string {
	const day = /^\d{4}-\d{2}-\d{2}$/.test(date.trim()) ? localDay(date.trim()) : '';
	const at = HHMM.test(time.trim()) ? clockTime(time, clock) : '';
	return [day, at].filter(Boolean).join(', ');
}

/** The place a time zone is named after, for sentences: 'America/New_York' → 'New York'. */
export function zonePlace(timeZone: string): string {
	const place = timeZone.split('/').pop() ?? timeZone;
	return place.replace(/_/g, ' ');
}
