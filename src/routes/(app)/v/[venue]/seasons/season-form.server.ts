import { fail } from '@sveltejs/kit';
import { SeasonRuleError, describeRule } from '$lib/schedule';
import { parseForm, keep } from '$lib/server/forms';
import {
	previewNights,
	type LeavingShow,
	type OverlappingNight,
	type SeasonFields
} from '$lib/server/schedule/seasons';
import { seasonFormSchema } from '$lib/schemas/schedule';
import { localTime, type Clock } from '$lib/util/when';

/** Reads the season form; a failure is ready to return from an action. */
export async function readSeasonForm(request: Request, timeZone: string) {
	const parsed = await parseForm(request, seasonFormSchema);
	const raw = parsed.raw;
	// The removal ticks are asked afresh after each answer, so they are not kept.
	const values = {
		...keep(raw, 'confirmRemoval', 'removeAssigned', 'confirmOverlap'),
		nights: [raw.nights ?? []].flat().map(String)
	};
	if (!parsed.ok)
		return { ok: false as const, failure: fail(400, { values, errors: parsed.errors }) };
	try {
		const nights = previewNights(parsed.data, timeZone);
		if (!nights.length) {
			return {
				ok: false as const,
				failure: fail(400, {
					values,
					errors: { firstNight: ['The rule gives no nights on or after the first night.'] }
				})
			};
		}
		return {
			ok: true as const,
			fields: parsed.data as SeasonFields,
			nights,
			values,
			removal: {
				confirmed: new Set(
					typeof raw.confirmRemoval === 'string'
						? raw.confirmRemoval.split(',').filter(Boolean)
						: []
				),
				assigned: raw.removeAssigned === 'on'
			},
			overlapConfirmed: raw.confirmOverlap === 'on'
		};
	} catch (e) {
		if (e instanceof SeasonRuleError) {
			const field = raw.ruleMode === 'typed' ? 'rule' : 'firstNight';
			return {
				ok: false as const,
				failure: fail(400, { values, errors: { [field]: [e.message] } })
			};
		}
		throw e;
	}
}

/** What the preview shows: each night's local doors and crew call. */
export function previewOf(
	fields: SeasonFields,
	nights: ReturnType<typeof previewNights>,
	timeZone: string,
	clock: Clock,
	leaving: LeavingShow[] = [],
	overlaps: OverlappingNight[] = []
) {
	return {
		summary: describeRule(fields.rule),
		rule: fields.rule,
		nights: nights.map((n) => ({
			date: n.date,
			doorsOpen: localTime(n.doorsOpen, timeZone, clock),
			doorsClose: localTime(n.doorsClose, timeZone, clock),
			crewCall: localTime(n.crewCall, timeZone, clock),
			extra: n.extra,
			opening: n.date === fields.openingNight
		})),
		darkNights: fields.darkNights,
		leaving: leaving.map((s) => ({ date: s.date, assignments: s.assignments, results: s.results })),
		overlaps
	};
}

/**
 * What to ask when saving would put nights on top of another season's (or a one-off) show and the
 * planner has not yet ticked that both should stay; null when there is nothing to ask.
 */
export function overlapQuestion(overlaps: OverlappingNight[], confirmed: boolean): string | null {
	if (!overlaps.length || confirmed) return null;
	const n = overlaps.length;
	return `${n === 1 ? 'A night' : `${n} nights`} of this season ${n === 1 ? 'falls' : 'fall'} on another show's doors (listed below). Tick “Keep both shows on these nights” to save anyway, or change the rule or dark nights.`;
}
