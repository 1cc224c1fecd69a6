import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { showAccess } from '$lib/server/checklists/access';
import { loadChecklist } from '$lib/server/checklists/state';
import { withFreshChecklist } from '$lib/server/checklists/sync';
import { progressByRoom, signOffBlockers } from '$lib/checklists/view';
import type { RequestHandler } from './$types';

/** A show's checks with their latest results, progress by room and what blocks sign-off. */
export const GET: RequestHandler = async (event) => {
	const venue = requireRole(event);
	const access = await showAccess(db, venue, event.locals.person!.id, event.params.show);
	if (!access.ok) return json({ message: access.message }, { status: access.status });
	const state = await withFreshChecklist(db, venue.id, access.show.id, () =>
		loadChecklist(db, venue, access.show.id)
	);
	return json(
		{
			...state,
			progress: progressByRoom(state.checks),
			blockers: signOffBlockers(state.checks)
		},
		{ headers: { 'cache-control': 'no-store' } }
	);
};
