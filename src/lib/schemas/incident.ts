import { z } from 'zod';
import { num } from './num';
import { INCIDENT_KINDS } from './incident-words';

const optText = (max: number, what: string) =>
	z.preprocess(
		(v) => (typeof v === 'string' && v.trim() === '' ? undefined : v),
		z.string().trim().max(max, `Keep ${what} under ${max} characters.`).optional()
	);
const blankToUndefined = (v: unknown) => (v === '' ? undefined : v);

/** A wall-clock time in the venue's zone as a date-and-time field sends it: 2027-10-01T21:40. */
const WALL = /^(\d{4})-(\d{2})-(\d{2})[T ](\d{2}):(\d{2})$/;

const stopped = num('How long the show stopped', { int: true, min: 0, max: 1440 });
/** Whole minutes the show stopped: 0 when it did not; a negative figure gets its own words. */
const minutes = z.unknown().transform((raw, ctx) => {
	const r = stopped.safeParse(raw);
	if (r.success) return r.data;
	const negative = typeof raw === 'string' && /^\s*[-−]\s*\d/.test(raw);
	if (negative) {
		ctx.addIssue({
			code: 'custom',
			message: 'Minutes cannot be below 0: give 0 when the show did not stop.',
			input: raw
		});
	} else {
		for (const issue of r.error.issues)
			ctx.addIssue({ code: 'custom', message: issue.message, input: raw });
	}
	return z.NEVER;
}) as unknown as z.ZodType<number, unknown>;

export const incidentReportSchema = z.object({
	kind: z.enum(INCIDENT_KINDS, { error: 'Pick what kind of incident it was.' }),
	happenedAt: z
		.string({ error: 'Give the time it happened.' })
		.trim()
		.min(1, 'Give the time it happened.')
		.refine((v) => {
			const m = WALL.exec(v);
			if (!m) return false;
			const [y, mo, d, h, mi] = m.slice(1).map(Number);
			const day = new Date(Date.UTC(y, mo - 1, d));
			return day.getUTCMonth() === mo - 1 && day.getUTCDate() === d && h < 24 && mi < 60;
		}, 'Give the day and time it happened, for example 2027-10-01 21:40.')
		.transform((v) => {
			const m = WALL.exec(v)!;
			return { date: `${m[1]}-${m[2]}-${m[3]}`, time: `${m[4]}:${m[5]}` };
		}),
	roomId: z.preprocess(
		blankToUndefined,
		z.uuid({ error: 'Pick a room from the list.' }).optional()
	),
	whatHappened: z
		.string({ error: 'Say what happened.' })
		.trim()
		.min(3, 'Say what happened, in a few words.')
		.max(2000, 'Keep it under 2000 characters.'),
	whatWasDone: z
		.string({ error: 'Say what was done about it.' })
		.trim()
		.min(3, 'Say what was done about it, in a few words.')
		.max(2000, 'Keep it under 2000 characters.'),
	firstAid: z.enum(['yes', 'no'], { error: 'Say whether first aid was given.' }),
	firstAidGiven: optText(300, 'the first aid given'),
	stoppedMinutes: minutes,
	followUpBy: z.preprocess(
		blankToUndefined,
		z.string().max(100, 'Pick a member from the list.').optional()
	)
});

const note = (what: string) =>
	z
		.string({ error: `Write the ${what}.` })
		.trim()
		.min(3, `Write the ${what}, in a few words.`)
		.max(2000, 'Keep it under 2000 characters.');

export const incidentFollowUpSchema = z.object({
	incidentId: z.uuid({ error: 'Pick the incident the note is for.' }),
	note: note('follow-up note')
});

export const incidentCloseSchema = z.object({
	incidentId: z.uuid({ error: 'Pick the incident to close.' }),
	note: note('closing note')
});
