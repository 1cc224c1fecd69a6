// One clock for the whole app: every instant is shown in the venue's time zone, the same way on
// the server and in the browser, as 'Fri 1 Oct 2027' and '21:41' (24-hour clock).

const formatters = new Map<string, Intl.DateTimeFormat>();

/** Formatters are costly to build; one per zone and style is kept. */
function formatter(key: string, make: () => Intl.DateTimeFormat): Intl.DateTimeFormat {
	let f = formatters.get(key);
	if (!f) formatters.set(key, (f = make()));
	return f;
}

const TIME = { hour: '2-digit', minute: '2-digit', hourCycle: 'h23' } as const;

/** Wall-clock words for an instant in the venue's time zone: '21:41'. */
export function localTime(at: Date | string, timeZone: string): string {
	return formatter(
		`time ${timeZone}`,
		() => new Intl.DateTimeFormat('en-GB', { timeZone, ...TIME })
	).format(new Date(at));
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

/** Day and time of an instant in the venue's time zone: 'Fri 1 Oct 2027, 21:41'. */
export function localDateTime(at: Date | string, timeZone: string): string {
	return `${localDayOf(at, timeZone)}, ${localTime(at, timeZone)}`;
}

/** The place a time zone is named after, for sentences: 'America/New_York' → 'New York'. */
export function zonePlace(timeZone: string): string {
	const place = timeZone.split('/').pop() ?? timeZone;
	return place.replace(/_/g, ' ');
}
