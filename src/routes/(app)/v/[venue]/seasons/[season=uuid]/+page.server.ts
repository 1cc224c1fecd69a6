import { error, fail, redirect } from '@sveltejs/kit';
import { and, eq } from 'drizzle-orm';
import { z } from 'zod';
import { describeRule, ruleToParts, SeasonRuleError } from '$lib/schedule';
import { PLANNERS, requireRole } from '$lib/server/auth/guard';
import { audit } from '$lib/server/audit';
import { db } from '$lib/server/db';
import { seasons } from '$lib/server/db/schema';
import { isRestrictViolation } from '$lib/server/db/errors';
import {
	leavingShows,
	recordedNights,
	removedBy,
	seasonShows,
	overlappingNights,
	updateSeason
} from '$lib/server/schedule/seasons';
import { incidentCounts } from '$lib/server/incidents/records';
import { localDay, localTime, timeValue } from '$lib/util/when';
import { overlapQuestion, previewOf, readSeasonForm } from '../season-form.server';
import type { Actions, PageServerLoad } from './$types';

async function findSeason(venueId: string, id: string) {
	if (!z.uuid().safeParse(id).success) return null;
	const [season] = await db
		.select()
		.from(seasons)
		.where(and(eq(seasons.id, id), eq(seasons.venueId, venueId)));
	return season ?? null;
}

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event);
	if (venue.role === 'crew') error(403, 'Crew see their nights under My nights.');
	const season = await findSeason(venue.id, event.params.season);
	if (!season) error(404, 'There is no such season.');
	const list = await seasonShows(db, venue.id, season.id);
	// Incidents are read by show managers and owners (and the crew of each night, elsewhere).
	const planner = PLANNERS.includes(venue.role);
	const counts = planner
		? await incidentCounts(
				db,
				venue.id,
				list.map((s) => s.id)
			)
		: new Map<string, { total: number; open: number }>();
	let parts = null;
	let summary = season.rule;
	try {
		parts = ruleToParts(season.rule);
		summary = describeRule(season.rule);
	} catch (e) {
		if (!(e instanceof SeasonRuleError)) throw e;
	}
	return {
		season,
		summary,
		initial: {
			name: season.name,
			firstNight: season.firstNight,
			ruleMode: parts ? 'simple' : 'typed',
			nights: parts?.nightsOfWeek ?? [],
			everyNWeeks: String(parts?.everyNWeeks ?? 1),
			endMode: parts?.count ? 'count' : 'until',
			until: parts?.until ?? '',
			count: parts?.count ? String(parts.count) : '',
			rule: season.rule,
			doorsOpen: timeValue(season.doorsOpen),
			doorsClose: timeValue(season.doorsClose),
			crewCallMinutesBefore: String(season.crewCallMinutesBefore),
			darkNights: season.darkNights.join('\n'),
			extraNights: season.extraNights.join('\n'),
			openingNight: season.openingNight ?? ''
		},
		shows: list.map((s) => ({
			id: s.id,
			date: s.date,
			status: s.status,
			edited: s.edited,
			openingNight: s.openingNight,
			doorsOpen: localTime(s.doorsOpen, venue.timeZone, venue.clock),
			crewCall: localTime(s.crewCall, venue.timeZone, venue.clock),
			incidents: counts.get(s.id) ?? null
		})),
		incidentTotal: [...counts.values()].reduce((n, c) => n + c.total, 0),
		canEdit: planner
	};
};

export const actions: Actions = {
	preview: async (event) => {
		const venue = requireRole(event, ...PLANNERS);
		if (!(await findSeason(venue.id, event.params.season)))
			return fail(404, { message: 'That season no longer exists.' });
		const read = await readSeasonForm(event.request, venue.timeZone);
		if (!read.ok) return read.failure;
		const [leaving, overlaps] = await Promise.all([
			leavingShows(db, venue.id, event.params.season, read.nights),
			overlappingNights(db, venue.id, read.nights, event.params.season)
		]);
		return {
			values: read.values,
			preview: previewOf(read.fields, read.nights, venue.timeZone, venue.clock, leaving, overlaps)
		};
	},
	save: async (event) => {
		const venue = requireRole(event, ...PLANNERS);
		if (!(await findSeason(venue.id, event.params.season)))
			return fail(404, { message: 'That season no longer exists.' });
		const read = await readSeasonForm(event.request, venue.timeZone);
		if (!read.ok) return read.failure;
		// Nights that leave the rule go only when the manager has seen and ticked them (nights with
		// crew assigned only with the second tick); otherwise the preview comes back asking.
		const [leaving, overlaps] = await Promise.all([
			leavingShows(db, venue.id, event.params.season, read.nights),
			overlappingNights(db, venue.id, read.nights, event.params.season)
		]);
		const going = removedBy(leaving, { confirmed: 'all', assigned: read.removal.assigned });
		const unconfirmed = going.filter((s) => !read.removal.confirmed.has(s.date));
		const overlap = overlapQuestion(overlaps, read.overlapConfirmed);
		if (unconfirmed.length || overlap) {
			const n = going.length;
			return fail(400, {
				values: read.values,
				preview: previewOf(
					read.fields,
					read.nights,
					venue.timeZone,
					venue.clock,
					leaving,
					overlaps
				),
				errors: {
					...(unconfirmed.length
						? {
								confirmRemoval: [
									`Saving removes ${n === 1 ? 'a night' : `${n} nights`} that ${n === 1 ? 'is' : 'are'} no longer in the season (listed below). Tick “Remove the nights listed” to go ahead.`
								]
							}
						: {}),
					...(overlap ? { confirmOverlap: [overlap] } : {})
				}
			});
		}
		let result;
		try {
			result = await updateSeason(
				db,
				venue.id,
				event.params.season,
				venue.timeZone,
				read.fields,
				read.removal
			);
		} catch (e) {
			// A result recorded on a leaving night between the preview and this save.
			if (!isRestrictViolation(e)) throw e;
			return fail(409, {
				values: read.values,
				message:
					'Checks were recorded a moment ago on a night this change would remove. Nothing was saved: preview again to see which nights stay.'
			});
		}
		if (!result)
			return fail(404, { values: read.values, message: 'That season no longer exists.' });
		await audit(db, {
			venueId: venue.id,
			personId: event.locals.person!.id,
			action: 'season.changed',
			detail: { name: read.fields.name, ...result }
		});
		return { saved: result };
	},
	remove: async (event) => {
		const venue = requireRole(event, ...PLANNERS);
		const season = await findSeason(venue.id, event.params.season);
		if (!season) return fail(404, { message: 'That season no longer exists.' });
		const refusal = (dates: string[]) =>
			fail(400, {
				message: `${season.name} cannot be removed: checks or incidents were recorded on ${dates.length === 1 ? '1 night' : `${dates.length} nights`} (${dates.slice(0, 5).map(localDay).join(', ')}${dates.length > 5 ? '…' : ''}), and that history is kept for good. To end the season early, change its last night; to take a night off the calendar, cancel it on its own page.`
			});
		const recorded = await recordedNights(db, venue.id, season.id);
		if (recorded.length) return refusal(recorded);
		try {
			await db.delete(seasons).where(and(eq(seasons.id, season.id), eq(seasons.venueId, venue.id)));
		} catch (e) {
			// A result recorded between the look and the removal.
			if (!isRestrictViolation(e)) throw e;
			return refusal(await recordedNights(db, venue.id, season.id));
		}
		await audit(db, {
			venueId: venue.id,
			personId: event.locals.person!.id,
			action: 'season.removed',
			detail: { name: season.name }
		});
		redirect(303, `/v/${venue.slug}/seasons`);
	}
};
