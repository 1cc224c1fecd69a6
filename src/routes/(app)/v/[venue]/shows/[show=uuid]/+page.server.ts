import { error, fail } from '@sveltejs/kit';
import { z } from 'zod';
import { PLANNERS, requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { restoreStandDown, signOff } from '$lib/server/checklists/signoff';
import { restoreSchema, sceneExclusionSchema, signOffSchema } from '$lib/schemas/checklist';
import { keep, parseForm } from '$lib/server/forms';
import { getShow, showAssignments } from '$lib/server/schedule/shows';
import {
	assignCrew,
	leaveSceneOut,
	putSceneBack,
	reassignCrew,
	recordGuestCount,
	saveShowStatus,
	saveShowTimes,
	showPageData,
	unassignCrew,
	type Refused
} from '$lib/server/schedule/show-page';
import {
	assignSchema,
	idSchema,
	reassignSchema,
	showStatusSchema,
	showTimesSchema
} from '$lib/schemas/schedule';
import { noticeRunSheetChanges } from '$lib/server/runsheets/send';
import { guestCountSchema } from '$lib/schemas/wear';
import type { VenueContext } from '$lib/server/auth/types';
import type { Actions, PageServerLoad, RequestEvent } from './$types';

/** The route's show in this venue, or null. */
async function findShow(venueId: string, id: string) {
	if (!z.uuid().safeParse(id).success) return null;
	return getShow(db, venueId, id);
}

/** A refusal from the show-page work as the form's failure, keeping what was typed. */
function refused(action: string, done: Refused, raw: Record<string, unknown>, extra = {}) {
	return 'errors' in done
		? fail(400, { action, ...extra, values: keep(raw), errors: done.errors })
		: fail(done.status, { action, ...extra, message: done.message });
}

/** The show and the person for a planner's action, or the failure to answer. */
async function planned(event: RequestEvent, venue: VenueContext, action: string) {
	const show = await findShow(venue.id, event.params.show);
	if (!show) return { gone: fail(404, { action, message: 'That show no longer exists.' }) };
	return { gone: null, venue, show, personId: event.locals.person!.id };
}

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event);
	const show = await findShow(venue.id, event.params.show);
	if (!show) error(404, 'There is no such show.');
	const person = event.locals.person!;
	const planner = PLANNERS.includes(venue.role);
	// Crew are let in only to their own shows: check that before reading the rest.
	const assigned = venue.role === 'crew' ? await showAssignments(db, venue.id, show.id) : null;
	if (assigned && !assigned.some((a) => a.personId === person.id)) {
		error(403, 'Crew see the shows they are assigned to, under My nights.');
	}
	return showPageData(db, venue, person.id, show, planner, assigned);
};

export const actions: Actions = {
	times: async (event) => {
		const p = await planned(event, requireRole(event, ...PLANNERS), 'times');
		if (p.gone) return p.gone;
		const parsed = await parseForm(event.request, showTimesSchema);
		if (!parsed.ok)
			return fail(400, { action: 'times', values: keep(parsed.raw), errors: parsed.errors });
		const done = await saveShowTimes(db, p.venue, p.personId, p.show, parsed.data);
		if (!done.ok) return refused('times', done, parsed.raw);
		await noticeRunSheetChanges(db, p.venue.id, p.show.id, event);
		return { action: 'times', saved: true };
	},
	status: async (event) => {
		const p = await planned(event, requireRole(event, ...PLANNERS), 'status');
		if (p.gone) return p.gone;
		const parsed = await parseForm(event.request, showStatusSchema);
		if (!parsed.ok) return fail(400, { action: 'status', message: 'Pick a status.' });
		await saveShowStatus(db, p.venue, p.personId, p.show, parsed.data.status);
		await noticeRunSheetChanges(db, p.venue.id, p.show.id, event);
		return { action: 'status', saved: true };
	},
	assign: async (event) => {
		const p = await planned(event, requireRole(event, ...PLANNERS), 'assign');
		if (p.gone) return p.gone;
		const parsed = await parseForm(event.request, assignSchema);
		if (!parsed.ok)
			return fail(400, { action: 'assign', values: keep(parsed.raw), errors: parsed.errors });
		const done = await assignCrew(db, p.venue, p.personId, p.show, parsed.data);
		if (!done.ok) return refused('assign', done, parsed.raw);
		await noticeRunSheetChanges(db, p.venue.id, p.show.id, event);
		return { action: 'assign', saved: true };
	},
	reassign: async (event) => {
		const p = await planned(event, requireRole(event, ...PLANNERS), 'reassign');
		if (p.gone) return p.gone;
		const parsed = await parseForm(event.request, reassignSchema);
		const id = typeof parsed.raw.id === 'string' ? parsed.raw.id : '';
		if (!parsed.ok)
			return fail(400, { action: 'reassign', id, values: keep(parsed.raw), errors: parsed.errors });
		const done = await reassignCrew(db, p.venue, p.personId, p.show, parsed.data);
		if (!done.ok) return refused('reassign', done, parsed.raw, { id });
		await noticeRunSheetChanges(db, p.venue.id, p.show.id, event);
		return { action: 'reassign', id, saved: true };
	},
	unassign: async (event) => {
		const venue = requireRole(event, ...PLANNERS);
		const parsed = await parseForm(event.request, idSchema);
		if (!parsed.ok)
			return fail(400, { action: 'unassign', message: 'That assignment no longer exists.' });
		const done = await unassignCrew(db, venue, event.locals.person!.id, parsed.data.id);
		if (!done.ok) return refused('unassign', done, parsed.raw);
		await noticeRunSheetChanges(db, venue.id, done.showId, event);
		return { action: 'unassign', saved: true };
	},
	exclude: async (event) => {
		const p = await planned(event, requireRole(event, ...PLANNERS), 'exclude');
		if (p.gone) return p.gone;
		const parsed = await parseForm(event.request, sceneExclusionSchema);
		if (!parsed.ok) return fail(400, { action: 'exclude', message: 'Pick a scene.' });
		const done = await leaveSceneOut(db, p.venue, p.personId, p.show, parsed.data);
		if (!done.ok) return refused('exclude', done, parsed.raw);
		await noticeRunSheetChanges(db, p.venue.id, p.show.id, event);
		return { action: 'exclude', saved: true };
	},
	include: async (event) => {
		const p = await planned(event, requireRole(event, ...PLANNERS), 'include');
		if (p.gone) return p.gone;
		const parsed = await parseForm(event.request, sceneExclusionSchema);
		if (!parsed.ok) return fail(400, { action: 'include', message: 'Pick a scene.' });
		const done = await putSceneBack(db, p.venue, p.personId, p.show, parsed.data.sceneId);
		if (!done.ok) return refused('include', done, parsed.raw);
		await noticeRunSheetChanges(db, p.venue.id, p.show.id, event);
		return { action: 'include', saved: true };
	},
	restore: async (event) => {
		const p = await planned(event, requireRole(event, ...PLANNERS), 'restore');
		if (p.gone) return p.gone;
		const parsed = await parseForm(event.request, restoreSchema);
		if (!parsed.ok)
			return fail(400, { action: 'restore', values: keep(parsed.raw), errors: parsed.errors });
		const done = await restoreStandDown(db, p.venue, p.show.id, p.personId, parsed.data);
		if (!done.ok)
			return fail(400, {
				action: 'restore',
				values: keep(parsed.raw),
				errors: { reason: [done.message] }
			});
		await noticeRunSheetChanges(db, p.venue.id, p.show.id, event);
		return { action: 'restore', saved: true, propName: done.propName };
	},
	signOff: async (event) => {
		const p = await planned(event, requireRole(event, ...PLANNERS), 'signOff');
		if (p.gone) return p.gone;
		const parsed = await parseForm(event.request, signOffSchema);
		if (!parsed.ok)
			return fail(400, { action: 'signOff', values: keep(parsed.raw), errors: parsed.errors });
		const { note, ack } = parsed.data;
		const done = await signOff(db, p.venue, p.show.id, p.personId, note, ack);
		if (!done.ok)
			return fail(400, {
				action: 'signOff',
				values: keep(parsed.raw, 'ack'),
				refused: done.message,
				blockers: done.blockers,
				unacknowledged: done.unacknowledged?.map((u) => u.key) ?? []
			});
		return { action: 'signOff', saved: true };
	},
	guests: async (event) => {
		const p = await planned(event, requireRole(event, ...PLANNERS), 'guests');
		if (p.gone) return p.gone;
		const parsed = await parseForm(event.request, guestCountSchema);
		if (!parsed.ok)
			return fail(400, { action: 'guests', values: keep(parsed.raw), errors: parsed.errors });
		await recordGuestCount(db, p.venue, p.personId, p.show, parsed.data);
		return { action: 'guests', saved: true };
	}
};
