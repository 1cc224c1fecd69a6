const DATE = /^(\d{4})-(\d{2})-(\d{2})$/;
const TIME = /^([01]\d|2[0-3]):([0-5]\d)$/;
const DAY_MS = 86_400_000;

// One formatter per zone for the life of the process: building one costs far more than using it.
// Only zones the runtime accepted are kept, so the cache is bounded by the zone database.
const formatters = new Map<string, Intl.DateTimeFormat>();
const EN_US = /^(\d{1,2})\/(\d{1,2})\/(\d{4}), (\d{2}):(\d{2}):(\d{2})$/;

function formatterFor(timeZone: string): Intl.DateTimeFormat | null {
	const known = formatters.get(timeZone);
	if (known) return known;
	if (typeof timeZone !== 'string' || timeZone.trim() === '') return null;
	try {
		const made = new Intl.DateTimeFormat('en-US', {
			timeZone,
			hourCycle: 'h23',
			year: 'numeric',
			month: 'numeric',
			day: 'numeric',
			hour: 'numeric',
			minute: 'numeric',
			second: 'numeric'
		});
		formatters.set(timeZone, made);
		return made;
	} catch {
		return null;
	}
}

/** True when the name is an IANA time zone this runtime knows, such as 'Europe/London'. */
export function isTimeZone(timeZone: string): boolean {
	return formatterFor(timeZone) !== null;
}

/** Milliseconds the wall clock of a time zone is ahead of UTC at an instant (negative: behind). */
export function zoneOffsetMs(timeZone: string, at: number): number {
	const f = formatterFor(timeZone);
	if (!f) throw new RangeError(`Unknown time zone: '${timeZone}'`);
	let wall: number;
	// Plain format() is several times quicker than formatToParts(); its en-US shape is fixed.
	const m = EN_US.exec(f.format(at));
	if (m) wall = Date.UTC(+m[3], +m[1] - 1, +m[2], +m[4], +m[5], +m[6]);
	else {
		const p: Record<string, number> = {};
		for (const part of f.formatToParts(at)) if (part.type !== 'literal') p[part.type] = +part.value;
		wall = Date.UTC(p.year, p.month - 1, p.day, p.hour, p.minute, p.second);
	}
	const ms = ((at % 1000) + 1000) % 1000;
	return wall + ms - at;
}

/** Parses 'YYYY-MM-DD' into a floating date (midnight UTC standing for the wall date), or null. */
export function parseDate(date: string): Date | null {
	const m = DATE.exec(date);
	if (!m) return null;
	const [y, mo, d] = [Number(m[1]), Number(m[2]), Number(m[3])];
	const floating = new Date(Date.UTC(y, mo - 1, d));
	if (floating.getUTCFullYear() !== y || floating.getUTCMonth() !== mo - 1) return null;
	if (floating.getUTCDate() !== d) return null;
	return floating;
}

/** Minutes after midnight for 'HH:MM' (24-hour clock), or null. */
export function parseTime(time: string): number | null {
	const m = TIME.exec(time);
	return m ? Number(m[1]) * 60 + Number(m[2]) : null;
}

/** 'YYYY-MM-DD' of a floating date. */
export function formatDate(floating: Date): string {
	return floating.toISOString().slice(0, 10);
}

/** 'YYYY-MM-DD' of the day after. */
export function nextDate(date: string): string {
	const floating = parseDate(date);
	if (!floating) throw new RangeError(`Not a date: '${date}' (use YYYY-MM-DD)`);
	return formatDate(new Date(floating.getTime() + DAY_MS));
}

/** The wall clock in a time zone at an instant, as a floating date. */
export function instantToWall(instant: Date, timeZone: string): Date {
	const t = instant.getTime();
	return new Date(t + zoneOffsetMs(timeZone, t));
}

/**
 * The instant a floating wall time stands for, given the zone's offset at any instant. As RFC 5545
 * §3.3.5 asks: a time that occurs twice (clocks going back) is the first occurrence, and a time
 * skipped by clocks going forward uses the UTC offset from before the gap, landing that much later.
 */
function floatingToInstant(floating: number, offsetAt: (t: number) => number): number {
	// Offsets change at most once in a day in every zone, so the offsets a day either side cover it.
	const before = offsetAt(floating - DAY_MS);
	const after = offsetAt(floating + DAY_MS);
	if (before === after) return floating - before;
	const fits = [floating - before, floating - after].filter((t) => t + offsetAt(t) === floating);
	return fits.length > 0 ? Math.min(...fits) : floating - before;
}

function floatingOf(date: string, time: string): number {
	const day = parseDate(date);
	const minutes = parseTime(time);
	if (!day) throw new RangeError(`Not a date: '${date}' (use YYYY-MM-DD)`);
	if (minutes === null) throw new RangeError(`Not a time: '${time}' (use HH:MM, 24-hour clock)`);
	return day.getTime() + minutes * 60_000;
}

/** The instant when the wall clock in a time zone shows a date and time (gaps and overlaps above). */
export function wallToInstant(date: string, time: string, timeZone: string): Date {
	const floating = floatingOf(date, time);
	if (!isTimeZone(timeZone)) throw new RangeError(`Unknown time zone: '${timeZone}'`);
	return new Date(floatingToInstant(floating, (t) => zoneOffsetMs(timeZone, t)));
}

/**
 * A wallToInstant for many dates of one zone between two dates: the zone's offset is read once a
 * day across the span and each change found to the millisecond, so every conversion after that is
 * arithmetic. Same answers as wallToInstant, on the same assumption (one change a day at most).
 */
export function wallClock(timeZone: string, fromDate: string, toDate: string) {
	if (!isTimeZone(timeZone)) throw new RangeError(`Unknown time zone: '${timeZone}'`);
	const from = floatingOf(fromDate, '00:00') - 3 * DAY_MS;
	const to = floatingOf(toDate, '00:00') + 4 * DAY_MS;
	const read = (t: number) => zoneOffsetMs(timeZone, t);
	const first = read(from);
	// Offset changes in time order: from `at` on, the zone is `offset` ahead of UTC.
	const changes: { at: number; offset: number }[] = [];
	let a = from;
	let offA = first;
	for (let b = from + DAY_MS; b <= to; b += DAY_MS) {
		const offB = read(b);
		if (offB !== offA) {
			let lo = a;
			let hi = b;
			while (hi - lo > 1) {
				const mid = lo + Math.floor((hi - lo) / 2);
				if (read(mid) === offA) lo = mid;
				else hi = mid;
			}
			changes.push({ at: hi, offset: offB });
		}
		a = b;
		offA = offB;
	}
	const offsetAt = (t: number) => {
		if (t < from || t > to) return read(t);
		let offset = first;
		for (const c of changes) {
			if (c.at > t) break;
			offset = c.offset;
		}
		return offset;
	};
	return (date: string, time: string) =>
		new Date(floatingToInstant(floatingOf(date, time), offsetAt));
}

/** The wall clock in a time zone at an instant, as 'YYYY-MM-DDTHH:MM:SS' without an offset. */
export function wallText(instant: Date | string, timeZone: string): string {
	return instantToWall(new Date(instant), timeZone).toISOString().slice(0, 19);
}

/** A time zone's offset from UTC at an instant, as '+HH:MM' or '-HH:MM'. */
export function offsetText(timeZone: string, at: Date = new Date()): string {
	// From the zone's offset this module works out already, so the calendar page ships no date library.
	const minutes = Math.round(zoneOffsetMs(timeZone, at.getTime()) / 60_000);
	const a = Math.abs(minutes);
	const two = (n: number) => String(n).padStart(2, '0');
	return `${minutes < 0 ? '-' : '+'}${two(Math.floor(a / 60))}:${two(a % 60)}`;
}

/** The date on the wall calendar of a time zone at an instant, 'YYYY-MM-DD'. */
export function dateIn(timeZone: string, at: Date = new Date()): string {
	return wallText(at, timeZone).slice(0, 10);
}
