import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { showAccess } from '$lib/server/checklists/access';
import { currentChecklist } from '$lib/server/checklists/copies';
import type { RequestHandler } from './$types';

/** A show's checks with their latest results, progress by room and what blocks sign-off. */
export const GET: RequestHandler = async (event) => {
	const venue = requireRole(event);
	const access = await showAccess(db, venue, event.locals.person!.id, event.params.show);
	if (!access.ok) return json({ message: access.message }, { status: access.status });
	const copy = await currentChecklist(db, venue, access.show.id);
	return new Response(copy.json(), {
		headers: { 'content-type': 'application/json', 'cache-control': 'no-store' }
	});
};
