import { crewCallAt } from './crew';
import { RRule, type RRuleOptions } from './rrule';
import {
	formatDate,
	instantToWall,
	isTimeZone,
	nextDate,
	parseDate,
	parseTime,
	wallClock
} from './wall-time';

/** RFC 5545 day codes, Monday first. */
export const WEEKDAYS = ['MO', 'TU', 'WE', 'TH', 'FR', 'SA', 'SU'] as const;
export type Weekday = (typeof WEEKDAYS)[number];

/** The simple season shape the season editor offers: some nights of the week, every N weeks. */
export interface SeasonRuleParts {
	nightsOfWeek: Weekday[];
	everyNWeeks?: number;
	/** Last night, inclusive, 'YYYY-MM-DD'. Give this or count. */
	until?: string;
	count?: number;
}

export interface SeasonInput {
	/** IANA time zone of the venue, such as 'Europe/London'. */
	timeZone: string;
	/** 'YYYY-MM-DD'; the season runs the rule's nights on or after this date. */
	firstNight: string;
	/** An RFC 5545 RRULE ('FREQ=WEEKLY;BYDAY=FR,SA;UNTIL=20271031') or the simple shape. */
	rule: string | SeasonRuleParts;
	/** 'HH:MM' local time. */
	doorsOpen: string;
	/** 'HH:MM' local time; at or before doors open means after midnight, on the next day. */
	doorsClose: string;
	crewCallMinutesBefore: number;
	darkNights?: string[];
	extraNights?: string[];
}

/** One show night. Instants are real moments (UTC inside a Date); date is the venue's local date. */
export interface ShowNight {
	date: string;
	doorsOpen: Date;
	doorsClose: Date;
	crewCall: Date;
	/** Added by hand rather than produced by the rule. */
	extra: boolean;
}

export interface ExpandOptions {
	/** Needed when the rule has neither UNTIL nor COUNT: stop after this date ('YYYY-MM-DD'). */
	through?: string;
	/** Refuse to produce more nights than this. */
	maxNights?: number;
}

export class SeasonRuleError extends Error {
	constructor(message: string) {
		super(message);
		this.name = 'SeasonRuleError';
	}
}

/** A checked rule: rrule options without dtstart/until, plus how UNTIL was written. */
export interface ParsedRule {
	options: Partial<RRuleOptions>;
	until:
		| { kind: 'date'; date: Date }
		| { kind: 'utc'; instant: Date }
		| { kind: 'local'; wall: Date }
		| null;
	count: number | null;
}

const FREQUENCIES: Record<string, number> = {
	YEARLY: RRule.YEARLY,
	MONTHLY: RRule.MONTHLY,
	WEEKLY: RRule.WEEKLY,
	DAILY: RRule.DAILY
};
const TIME_PARTS = ['BYHOUR', 'BYMINUTE', 'BYSECOND'];
const NUMBER_LISTS: Record<
	string,
	{ key: keyof RRuleOptions; min: number; max: number; name: string }
> = {
	BYMONTH: { key: 'bymonth', min: 1, max: 12, name: 'a month number 1 to 12' },
	BYMONTHDAY: { key: 'bymonthday', min: 1, max: 31, name: 'a day of the month ±1 to ±31' },
	BYYEARDAY: { key: 'byyearday', min: 1, max: 366, name: 'a day of the year ±1 to ±366' },
	BYWEEKNO: { key: 'byweekno', min: 1, max: 53, name: 'a week number ±1 to ±53' },
	BYSETPOS: { key: 'bysetpos', min: 1, max: 366, name: 'a position ±1 to ±366' }
};
const SIGNED = new Set(['BYMONTHDAY', 'BYYEARDAY', 'BYWEEKNO', 'BYSETPOS']);
const BYDAY = /^([+-]?\d{1,2})?(MO|TU|WE|TH|FR|SA|SU)$/;
const UNTIL = /^(\d{4})(\d{2})(\d{2})(?:T(\d{2})(\d{2})(\d{2})(Z)?)?$/;

function positiveInteger(name: string, value: string): number {
	if (!/^\d+$/.test(value) || Number(value) < 1) {
		throw new SeasonRuleError(`${name} must be a whole number of 1 or more, not '${value}'.`);
	}
	return Number(value);
}

/** Checks RRULE text and explains the first problem found. Accepts an optional 'RRULE:' prefix. */
export function parseSeasonRule(text: string): ParsedRule {
	const body = text.trim().replace(/^RRULE:/i, '');
	if (body === '') {
		throw new SeasonRuleError('The rule is empty. Start with FREQ, such as FREQ=WEEKLY.');
	}
	if (/[\r\n]/.test(body) || /DTSTART/i.test(body)) {
		throw new SeasonRuleError('Give one RRULE line only; the first night has its own field.');
	}
	const seen = new Map<string, string>();
	for (const part of body.split(';').filter((p) => p.trim() !== '')) {
		const eq = part.indexOf('=');
		if (eq < 1 || eq === part.length - 1) {
			throw new SeasonRuleError(`'${part}' is not NAME=VALUE. Parts are separated by semicolons.`);
		}
		const name = part.slice(0, eq).trim().toUpperCase();
		if (seen.has(name)) throw new SeasonRuleError(`${name} appears twice.`);
		seen.set(
			name,
			part
				.slice(eq + 1)
				.trim()
				.toUpperCase()
		);
	}

	const options: Partial<RRuleOptions> = {};
	let until: ParsedRule['until'] = null;
	let count: number | null = null;
	const freq = seen.get('FREQ');
	if (freq === undefined) throw new SeasonRuleError('The rule needs FREQ, such as FREQ=WEEKLY.');
	if (!(freq in FREQUENCIES)) {
		throw new SeasonRuleError(
			`FREQ=${freq} does not suit a season of nights: use DAILY, WEEKLY, MONTHLY or YEARLY.`
		);
	}
	options.freq = FREQUENCIES[freq];

	for (const [name, value] of seen) {
		if (name === 'FREQ') continue;
		if (TIME_PARTS.includes(name)) {
			throw new SeasonRuleError(`${name} is not used: show times come from doors open and close.`);
		}
		if (name === 'INTERVAL') options.interval = positiveInteger('INTERVAL', value);
		else if (name === 'COUNT') count = positiveInteger('COUNT', value);
		else if (name === 'WKST') {
			const index = WEEKDAYS.indexOf(value as Weekday);
			if (index < 0) throw new SeasonRuleError(`WKST must be a day code (MO..SU), not '${value}'.`);
			options.wkst = index;
		} else if (name === 'UNTIL') {
			const m = UNTIL.exec(value);
			const day = m ? parseDate(`${m[1]}-${m[2]}-${m[3]}`) : null;
			if (!m || !day || (m[4] !== undefined && (Number(m[4]) > 23 || Number(m[5]) > 59))) {
				throw new SeasonRuleError(
					`UNTIL must be a date like 20271031 or a UTC time like 20271031T235959Z, not '${value}'.`
				);
			}
			if (m[4] === undefined) until = { kind: 'date', date: day };
			else {
				const wall = new Date(
					day.getTime() + ((Number(m[4]) * 60 + Number(m[5])) * 60 + Number(m[6])) * 1000
				);
				until = m[7] ? { kind: 'utc', instant: wall } : { kind: 'local', wall };
			}
		} else if (name === 'BYDAY') {
			options.byweekday = value.split(',').map((day) => {
				const m = BYDAY.exec(day);
				const nth = m?.[1] === undefined ? 0 : Number(m[1]);
				if (!m || (nth === 0 && m[1] !== undefined) || Math.abs(nth) > 53) {
					throw new SeasonRuleError(
						`BYDAY takes day codes MO, TU, WE, TH, FR, SA, SU, optionally numbered like 1FR or -1SU; '${day}' is not one.`
					);
				}
				const weekday = RRule[m[2] as Weekday];
				return nth === 0 ? weekday : weekday.nth(nth);
			});
		} else if (name in NUMBER_LISTS) {
			const spec = NUMBER_LISTS[name];
			const values = value.split(',').map((item) => {
				const n = /^[+-]?\d+$/.test(item) ? Number(item) : NaN;
				const size = SIGNED.has(name) ? Math.abs(n) : n;
				if (!Number.isInteger(n) || size < spec.min || size > spec.max) {
					throw new SeasonRuleError(`${name} takes ${spec.name}; '${item}' is not one.`);
				}
				return n;
			});
			(options as Record<string, unknown>)[spec.key] = values;
		} else {
			throw new SeasonRuleError(`${name} is not part of an RFC 5545 recurrence rule.`);
		}
	}
	if (count !== null && until !== null) {
		throw new SeasonRuleError('Use UNTIL or COUNT, not both (RFC 5545 §3.3.10).');
	}
	if (
		options.bysetpos &&
		Object.keys(options).every((k) => !k.startsWith('by') || k === 'bysetpos')
	) {
		throw new SeasonRuleError('BYSETPOS needs another BY part (such as BYDAY) to pick from.');
	}
	return { options, until, count };
}

function checkParts(parts: SeasonRuleParts): void {
	if (parts.nightsOfWeek.length === 0)
		throw new SeasonRuleError('Pick at least one night of the week.');
	for (const day of parts.nightsOfWeek) {
		if (!WEEKDAYS.includes(day)) throw new SeasonRuleError(`'${day}' is not a day code (MO..SU).`);
	}
	const every = parts.everyNWeeks ?? 1;
	if (!Number.isInteger(every) || every < 1) {
		throw new SeasonRuleError('Every N weeks must be a whole number of 1 or more.');
	}
	if (parts.until !== undefined && parts.count !== undefined) {
		throw new SeasonRuleError('Give an end date or a number of nights, not both.');
	}
	if (parts.until !== undefined && !parseDate(parts.until)) {
		throw new SeasonRuleError(`The end date '${parts.until}' is not a date (use YYYY-MM-DD).`);
	}
	if (parts.count !== undefined && (!Number.isInteger(parts.count) || parts.count < 1)) {
		throw new SeasonRuleError('The number of nights must be a whole number of 1 or more.');
	}
}

function sortedDays(days: Weekday[]): Weekday[] {
	return WEEKDAYS.filter((day) => days.includes(day));
}

/** RRULE text for the simple shape. UNTIL is written as a date: the last night, inclusive. */
export function buildRule(parts: SeasonRuleParts): string {
	checkParts(parts);
	const rule = ['FREQ=WEEKLY'];
	const every = parts.everyNWeeks ?? 1;
	if (every > 1) rule.push(`INTERVAL=${every}`);
	rule.push(`BYDAY=${sortedDays(parts.nightsOfWeek).join(',')}`);
	if (parts.until !== undefined) rule.push(`UNTIL=${parts.until.replaceAll('-', '')}`);
	if (parts.count !== undefined) rule.push(`COUNT=${parts.count}`);
	return rule.join(';');
}

/** The simple shape of RRULE text, or null when the rule says more than the simple shape can. */
export function ruleToParts(text: string): SeasonRuleParts | null {
	const { options, until, count } = parseSeasonRule(text);
	if (until !== null && until.kind !== 'date') return null;
	const keys = Object.keys(options).filter((k) => !['freq', 'interval', 'wkst'].includes(k));
	let nightsOfWeek: Weekday[];
	if (options.freq === RRule.DAILY && keys.length === 0) {
		if ((options.interval ?? 1) !== 1) return null;
		nightsOfWeek = [...WEEKDAYS];
	} else if (options.freq === RRule.WEEKLY && keys.length === 1 && keys[0] === 'byweekday') {
		const days = options.byweekday as { weekday: number; n?: number }[];
		if (days.some((d) => d.n)) return null;
		nightsOfWeek = sortedDays(days.map((d) => WEEKDAYS[d.weekday]));
	} else return null;
	const parts: SeasonRuleParts = { nightsOfWeek };
	if (options.freq === RRule.WEEKLY && (options.interval ?? 1) > 1)
		parts.everyNWeeks = options.interval;
	if (until) parts.until = formatDate(until.date);
	if (count !== null) parts.count = count;
	return parts;
}

const DAY_NAMES: Record<Weekday, string> = {
	MO: 'Mondays',
	TU: 'Tuesdays',
	WE: 'Wednesdays',
	TH: 'Thursdays',
	FR: 'Fridays',
	SA: 'Saturdays',
	SU: 'Sundays'
};
const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

/** '31 Oct 2027' for 'YYYY-MM-DD'. */
export function formatDayMonthYear(date: string): string {
	const floating = parseDate(date);
	if (!floating) throw new RangeError(`Not a date: '${date}' (use YYYY-MM-DD)`);
	return `${floating.getUTCDate()} ${MONTHS[floating.getUTCMonth()]} ${floating.getUTCFullYear()}`;
}

function joinWords(words: string[]): string {
	return words.length < 2 ? words.join('') : `${words.slice(0, -1).join(', ')} and ${words.at(-1)}`;
}

/** A plain summary, such as 'Fridays and Saturdays until 31 Oct 2027'. */
export function describeRule(rule: string | SeasonRuleParts): string {
	const parts = typeof rule === 'string' ? ruleToParts(rule) : (checkParts(rule), rule);
	if (parts === null) {
		const { options, until, count } = parseSeasonRule(rule as string);
		const end =
			until === null
				? null
				: until.kind === 'date'
					? until.date
					: until.kind === 'utc'
						? until.instant
						: until.wall;
		const text = new RRule({ ...options, count, until: end }).toText();
		return text.charAt(0).toUpperCase() + text.slice(1);
	}
	const days = sortedDays(parts.nightsOfWeek);
	const every = parts.everyNWeeks ?? 1;
	let summary = days.length === 7 ? 'Every night' : joinWords(days.map((d) => DAY_NAMES[d]));
	if (every > 1) summary += ` every ${every} weeks`;
	if (parts.until !== undefined) summary += ` until ${formatDayMonthYear(parts.until)}`;
	if (parts.count !== undefined)
		summary += ` for ${parts.count} night${parts.count === 1 ? '' : 's'}`;
	return summary;
}

function checkDates(label: string, dates: string[]): void {
	for (const date of dates) {
		if (!parseDate(date))
			throw new SeasonRuleError(`${label} '${date}' is not a date (use YYYY-MM-DD).`);
	}
}

/**
 * Every show night of a season. The rule runs on floating dates (wall dates held in UTC, so no
 * time zone arithmetic happens inside the recurrence); each night's wall times then become
 * instants in the venue's zone, so doors open at the same local time on both sides of a DST change.
 */
export function expandSeason(input: SeasonInput, options: ExpandOptions = {}): ShowNight[] {
	const { timeZone, firstNight, doorsOpen, doorsClose } = input;
	const maxNights = options.maxNights ?? 2000;
	if (!isTimeZone(timeZone)) throw new SeasonRuleError(`Unknown time zone: '${timeZone}'.`);
	const first = parseDate(firstNight);
	if (!first)
		throw new SeasonRuleError(`The first night '${firstNight}' is not a date (use YYYY-MM-DD).`);
	const openMinutes = parseTime(doorsOpen);
	const closeMinutes = parseTime(doorsClose);
	if (openMinutes === null) throw new SeasonRuleError(`Doors open '${doorsOpen}' is not HH:MM.`);
	if (closeMinutes === null) throw new SeasonRuleError(`Doors close '${doorsClose}' is not HH:MM.`);
	if (openMinutes === closeMinutes)
		throw new SeasonRuleError('Doors open and close at the same time.');
	const crewMinutes = input.crewCallMinutesBefore;
	if (!Number.isFinite(crewMinutes) || crewMinutes < 0) {
		throw new SeasonRuleError('Crew call must be zero or more minutes before doors.');
	}
	const darkNights = input.darkNights ?? [];
	const extraNights = input.extraNights ?? [];
	checkDates('Dark night', darkNights);
	checkDates('Extra night', extraNights);
	const through = options.through === undefined ? null : parseDate(options.through);
	if (options.through !== undefined && !through) {
		throw new SeasonRuleError(`'${options.through}' is not a date (use YYYY-MM-DD).`);
	}

	const text = typeof input.rule === 'string' ? input.rule : buildRule(input.rule);
	const parsed = parseSeasonRule(text);
	if (parsed.count === null && parsed.until === null && through === null) {
		throw new SeasonRuleError(
			'A season needs an end: add UNTIL (a last night) or COUNT (a number of nights).'
		);
	}
	// The recurrence starts at doors open so a UTC UNTIL bounds it as RFC 5545 intends.
	const dtstart = new Date(first.getTime() + openMinutes * 60_000);
	let until: Date | null = null;
	if (parsed.until?.kind === 'date') until = new Date(parsed.until.date.getTime() + 86_399_999);
	if (parsed.until?.kind === 'local') until = parsed.until.wall;
	if (parsed.until?.kind === 'utc') until = instantToWall(parsed.until.instant, timeZone);
	const end = through === null ? null : new Date(through.getTime() + 86_399_999);
	if (end !== null && (until === null || end < until)) until = end;

	const rule = new RRule({ ...parsed.options, dtstart, until, count: parsed.count, tzid: null });
	const dates: string[] = [];
	rule.all((date, i) => {
		if (i >= maxNights) {
			throw new SeasonRuleError(
				`The rule gives more than ${maxNights} nights; shorten the season.`
			);
		}
		dates.push(formatDate(date));
		return true;
	});

	const dark = new Set(darkNights);
	const fromRule = new Set(dates);
	const all = [...new Set([...dates, ...extraNights])].filter((date) => !dark.has(date)).sort();
	const afterMidnight = closeMinutes < openMinutes;
	if (all.length === 0) return [];
	// The zone's offset changes over the season are found once; each night is then arithmetic.
	const at = wallClock(timeZone, all[0], all[all.length - 1]);
	return all.map((date) => {
		const open = at(date, doorsOpen);
		return {
			date,
			doorsOpen: open,
			doorsClose: at(afterMidnight ? nextDate(date) : date, doorsClose),
			crewCall: crewCallAt(open, crewMinutes),
			extra: !fromRule.has(date)
		};
	});
}
