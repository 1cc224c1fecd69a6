import { formatInTimeZone } from 'date-fns-tz';

const DATE = /^(\d{4})-(\d{2})-(\d{2})$/;
const TIME = /^([01]\d|2[0-3]):([0-5]\d)$/;
const DAY_MS = 86_400_000;

/** True when the name is an IANA time zone this runtime knows, such as 'Europe/London'. */
export function isTimeZone(timeZone: string): boolean {
	if (typeof timeZone !== 'string' || timeZone.trim() === '') return false;
	try {
		new Intl.DateTimeFormat('en', { timeZone });
		return true;
	} catch {
		return false;
	}
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
	return new Date(formatInTimeZone(instant, timeZone, "yyyy-MM-dd'T'HH:mm:ss.SSS'Z'"));
}

/**
 * The instant when the wall clock in a time zone shows a date and time. As RFC 5545 §3.3.5 asks:
 * a time that occurs twice (clocks going back) is the first occurrence, and a time skipped by
 * clocks going forward uses the UTC offset from before the gap, landing that much later.
 */
export function wallToInstant(date: string, time: string, timeZone: string): Date {
	const day = parseDate(date);
	const minutes = parseTime(time);
	if (!day) throw new RangeError(`Not a date: '${date}' (use YYYY-MM-DD)`);
	if (minutes === null) throw new RangeError(`Not a time: '${time}' (use HH:MM, 24-hour clock)`);
	if (!isTimeZone(timeZone)) throw new RangeError(`Unknown time zone: '${timeZone}'`);
	const floating = day.getTime() + minutes * 60_000;
	const offsetAt = (t: number) => instantToWall(new Date(t), timeZone).getTime() - t;
	// Offsets change at most once in a day in every zone, so the offsets a day either side cover it.
	const before = offsetAt(floating - DAY_MS);
	const after = offsetAt(floating + DAY_MS);
	const fits = [floating - before, floating - after].filter(
		(t) => instantToWall(new Date(t), timeZone).getTime() === floating
	);
	return new Date(fits.length > 0 ? Math.min(...fits) : floating - before);
}

/** The wall clock in a time zone at an instant, as 'YYYY-MM-DDTHH:MM:SS' without an offset. */
export function wallText(instant: Date | string, timeZone: string): string {
	return instantToWall(new Date(instant), timeZone).toISOString().slice(0, 19);
}

/** A time zone's offset from UTC at an instant, as '+HH:MM' or '-HH:MM'. */
export function offsetText(timeZone: string, at: Date = new Date()): string {
	return formatInTimeZone(at, timeZone, 'xxx');
}

/** The date on the wall calendar of a time zone at an instant, 'YYYY-MM-DD'. */
export function dateIn(timeZone: string, at: Date = new Date()): string {
	return wallText(at, timeZone).slice(0, 10);
}
