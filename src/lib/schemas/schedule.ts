import { z } from 'zod';
import { WEEKDAYS, buildRule, parseDate, parseSeasonRule, SeasonRuleError } from '$lib/schedule';

const dateText = (message: string) =>
	z
		.string({ error: message })
		.trim()
		.refine((v) => parseDate(v) !== null, message);
const timeText = (message: string) =>
	z
		.string({ error: message })
		.trim()
		.regex(/^([01]\d|2[0-3]):[0-5]\d$/, message);

/** A list of dates typed one per line or separated by commas. */
const dateList = z
	.string()
	.optional()
	.transform((v, ctx) => {
		const items = (v ?? '')
			.split(/[\s,]+/)
			.map((s) => s.trim())
			.filter(Boolean);
		for (const item of items) {
			if (!parseDate(item)) {
				ctx.addIssue({ code: 'custom', message: `'${item}' is not a date (use YYYY-MM-DD).` });
				return z.NEVER;
			}
		}
		return [...new Set(items)].sort();
	});

const asArray = (v: unknown) => (v === undefined ? [] : Array.isArray(v) ? v : [v]);

/**
 * The season editor's form. The rule comes either from the simple fields (nights of the week,
 * every N weeks, until a date or a count) or from typed RRULE text.
 */
export const seasonFormSchema = z
	.object({
		name: z
			.string({ error: 'Name the season.' })
			.trim()
			.min(1, 'Name the season.')
			.max(80, 'Use at most 80 characters.'),
		firstNight: dateText('Give the first night as a date.'),
		ruleMode: z.enum(['simple', 'typed']).default('simple'),
		nights: z.preprocess(asArray, z.array(z.enum(WEEKDAYS))),
		everyNWeeks: z.coerce
			.number({ error: 'Give a whole number of weeks.' })
			.int('Give a whole number of weeks.')
			.min(1, 'Every 1 week or more.')
			.max(52, 'At most every 52 weeks.')
			.default(1),
		endMode: z.enum(['until', 'count']).default('until'),
		until: z.string().trim().optional(),
		count: z.string().trim().optional(),
		rule: z.string().trim().max(500, 'Use at most 500 characters.').optional(),
		doorsOpen: timeText('Give doors open as HH:MM (24-hour clock).'),
		doorsClose: timeText('Give doors close as HH:MM (24-hour clock).'),
		crewCallMinutesBefore: z.coerce
			.number({ error: 'Give the crew call in minutes.' })
			.int('Give a whole number of minutes.')
			.min(0, 'Crew call cannot be after doors open.')
			.max(720, 'At most 12 hours (720 minutes) before doors.'),
		darkNights: dateList,
		extraNights: dateList,
		openingNight: z
			.string()
			.trim()
			.optional()
			.refine(
				(v) => !v || parseDate(v) !== null,
				'Give the opening night as a date, or leave it empty.'
			)
			.transform((v) => (v ? v : null))
	})
	.transform((form, ctx) => {
		let rule: string;
		try {
			if (form.ruleMode === 'typed') {
				if (!form.rule) {
					ctx.addIssue({
						code: 'custom',
						path: ['rule'],
						message: 'Type a rule, such as FREQ=WEEKLY;BYDAY=FR,SA;UNTIL=20271031.'
					});
					return z.NEVER;
				}
				parseSeasonRule(form.rule);
				rule = form.rule.replace(/^RRULE:/i, '').toUpperCase();
			} else {
				if (form.endMode === 'until' && !parseDate(form.until ?? '')) {
					ctx.addIssue({
						code: 'custom',
						path: ['until'],
						message: 'Give the last night as a date.'
					});
					return z.NEVER;
				}
				const count = Number(form.count);
				if (form.endMode === 'count' && !(Number.isInteger(count) && count >= 1 && count <= 400)) {
					ctx.addIssue({
						code: 'custom',
						path: ['count'],
						message: 'Give a number of nights from 1 to 400.'
					});
					return z.NEVER;
				}
				if (!form.nights.length) {
					ctx.addIssue({
						code: 'custom',
						path: ['nights'],
						message: 'Pick at least one night of the week.'
					});
					return z.NEVER;
				}
				rule = buildRule({
					nightsOfWeek: form.nights,
					everyNWeeks: form.everyNWeeks,
					...(form.endMode === 'until' ? { until: form.until } : { count })
				});
			}
		} catch (e) {
			if (e instanceof SeasonRuleError) {
				ctx.addIssue({
					code: 'custom',
					path: [form.ruleMode === 'typed' ? 'rule' : 'nights'],
					message: e.message
				});
				return z.NEVER;
			}
			throw e;
		}
		return {
			name: form.name,
			firstNight: form.firstNight,
			rule,
			doorsOpen: form.doorsOpen,
			doorsClose: form.doorsClose,
			crewCallMinutesBefore: form.crewCallMinutesBefore,
			darkNights: form.darkNights,
			extraNights: form.extraNights,
			openingNight: form.openingNight
		};
	});

export const idSchema = z.object({ id: z.uuid('That no longer exists.') });

export const positionSchema = z.object({
	name: z
		.string({ error: 'Name the position.' })
		.trim()
		.min(1, 'Name the position.')
		.max(80, 'Use at most 80 characters.'),
	roomId: z
		.string()
		.optional()
		.transform((v) => (v ? v : null))
		.pipe(z.uuid('Pick a room from the list.').nullable()),
	required: z
		.string()
		.optional()
		.transform((v) => v === 'on' || v === 'true'),
	/** Its run sheet carries every room's hazards and the venue's safety items. */
	safetyPost: z
		.string()
		.optional()
		.transform((v) => v === 'on' || v === 'true'),
	/** How many people the post needs each night; left empty, one. */
	headcount: z.preprocess(
		(v) => (v === '' || v == null ? undefined : v),
		z.coerce
			.number({ error: 'Give how many people this post needs, as a whole number.' })
			.int('Give a whole number of people.')
			.min(1, 'A post needs at least 1 person.')
			.max(50, 'At most 50 people on one post.')
			.default(1)
	)
});

/** Changing a position in place: its id with the same fields. */
export const positionEditSchema = positionSchema.extend({
	id: z.uuid('That position does not exist.')
});

export const showTimesSchema = z.object({
	doorsOpen: timeText('Give doors open as HH:MM (24-hour clock).'),
	doorsClose: timeText('Give doors close as HH:MM (24-hour clock).'),
	crewCall: timeText('Give the crew call as HH:MM (24-hour clock).'),
	notes: z
		.string()
		.trim()
		.max(2000, 'Use at most 2000 characters.')
		.optional()
		.transform((v) => (v ? v : null))
});

export const showStatusSchema = z.object({
	status: z.enum(['scheduled', 'cancelled', 'dark'], { error: 'Pick a status.' })
});

export const assignSchema = z.object({
	positionId: z.uuid('Pick a position.'),
	personId: z.uuid('Pick a crew member.'),
	call: z
		.string()
		.trim()
		.optional()
		.transform((v) => (v ? v : null))
		.pipe(
			z
				.string()
				.regex(/^([01]\d|2[0-3]):[0-5]\d$/, 'Give the call as HH:MM, or leave it empty.')
				.nullable()
		)
});

/** Changing one assignment in place: its post and its own call (empty: the show's call). */
export const reassignSchema = assignSchema.omit({ personId: true }).extend({
	id: z.uuid('That assignment no longer exists.')
});

export const MOVE_SHOW_BODY =
	'Send a JSON body with showId (the show to move) and date (its new day, YYYY-MM-DD), for example {"showId": "…", "date": "2026-10-16"}.';

export const moveShowSchema = z.object(
	{
		showId: z.uuid({
			error: (iss) =>
				iss.input === undefined ? 'Say which show to move (showId).' : 'That show no longer exists.'
		}),
		date: dateText('Give the new date as YYYY-MM-DD.')
	},
	{ error: MOVE_SHOW_BODY }
);

export const dateSchema = z.object({ date: dateText('Give a date as YYYY-MM-DD.') });

/** The range the calendar asks for, as the venue's local dates ('YYYY-MM-DD', a time part is ignored). */
export const calendarRangeSchema = z
	.object({
		start: z.string({ error: 'Give start and end dates.' }),
		end: z.string({ error: 'Give start and end dates.' })
	})
	.transform((r, ctx) => {
		const start = r.start.slice(0, 10);
		const end = r.end.slice(0, 10);
		const from = parseDate(start);
		const to = parseDate(end);
		const problem =
			!from || !to
				? 'Give dates as YYYY-MM-DD.'
				: to <= from
					? 'The end must come after the start.'
					: to.getTime() - from.getTime() > 430 * 86_400_000
						? 'Ask for at most 14 months at a time.'
						: null;
		if (problem) {
			ctx.addIssue({ code: 'custom', message: problem });
			return z.NEVER;
		}
		return { start, end };
	});

export const oneOffSchema = z.object({
	date: dateText('Give the date as YYYY-MM-DD.'),
	doorsOpen: timeText('Give doors open as HH:MM (24-hour clock).'),
	doorsClose: timeText('Give doors close as HH:MM (24-hour clock).'),
	crewCallMinutesBefore: z.coerce
		.number({ error: 'Give the crew call in minutes.' })
		.int('Give a whole number of minutes.')
		.min(0, 'Crew call cannot be after doors open.')
		.max(720, 'At most 12 hours (720 minutes) before doors.'),
	notes: z
		.string()
		.trim()
		.max(2000, 'Use at most 2000 characters.')
		.optional()
		.transform((v) => (v ? v : null))
});
