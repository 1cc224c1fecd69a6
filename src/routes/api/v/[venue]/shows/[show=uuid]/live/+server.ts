import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { showAccess } from '$lib/server/checklists/access';
import { liveHub } from '$lib/server/checklists/hub';
import { showEventStream } from '$lib/server/checklists/live';
import type { RequestHandler } from './$types';

/** Server-Sent Events: 'changed' whenever a result, stand-down or sign-off is recorded. */
export const GET: RequestHandler = async (event) => {
	const venue = requireRole(event);
	const access = await showAccess(db, venue, event.locals.person!.id, event.params.show);
	if (!access.ok) return json({ message: access.message }, { status: access.status });
	return new Response(showEventStream(liveHub, access.show.id, event.request.signal), {
		headers: {
			'content-type': 'text/event-stream',
			'cache-control': 'no-store',
			'x-accel-buffering': 'no'
		}
	});
};
