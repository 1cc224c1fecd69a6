import { fail, redirect } from '@sveltejs/kit';
import { PLANNERS, requireRole } from '$lib/server/auth/guard';
import { audit } from '$lib/server/audit';
import { db } from '$lib/server/db';
import { createSeason, overlappingNights } from '$lib/server/schedule/seasons';
import { overlapQuestion, previewOf, readSeasonForm } from '../season-form.server';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	requireRole(event, ...PLANNERS);
	return {};
};

export const actions: Actions = {
	preview: async (event) => {
		const venue = requireRole(event, ...PLANNERS);
		const read = await readSeasonForm(event.request, venue.timeZone);
		if (!read.ok) return read.failure;
		const overlaps = await overlappingNights(db, venue.id, read.nights);
		return {
			values: read.values,
			preview: previewOf(read.fields, read.nights, venue.timeZone, venue.clock, [], overlaps)
		};
	},
	save: async (event) => {
		const venue = requireRole(event, ...PLANNERS);
		const read = await readSeasonForm(event.request, venue.timeZone);
		if (!read.ok) return read.failure;
		const overlaps = await overlappingNights(db, venue.id, read.nights);
		const question = overlapQuestion(overlaps, read.overlapConfirmed);
		if (question)
			return fail(400, {
				values: read.values,
				preview: previewOf(read.fields, read.nights, venue.timeZone, venue.clock, [], overlaps),
				errors: { confirmOverlap: [question] }
			});
		const { season, result } = await createSeason(db, venue.id, venue.timeZone, read.fields);
		await audit(db, {
			venueId: venue.id,
			personId: event.locals.person!.id,
			action: 'season.added',
			detail: { name: season.name, shows: result.added }
		});
		redirect(303, `/v/${venue.slug}/seasons/${season.id}`);
	}
};
