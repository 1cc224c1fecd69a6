import { json } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import { requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { showAccess } from '$lib/server/checklists/access';
import { photoPrefix } from '$lib/server/checklists/record';
import { objectStore } from '$lib/server/objects';
import { ingestCheckPhoto } from '$lib/server/props/uploads';
import type { RequestHandler } from './$types';

/** The body is the photo itself; the answer's key goes with the result that uses it. */
export const POST: RequestHandler = async (event) => {
	const venue = requireRole(event);
	const access = await showAccess(db, venue, event.locals.person!.id, event.params.show);
	if (!access.ok) return json({ message: access.message }, { status: access.status });
	const done = await ingestCheckPhoto({
		store: objectStore(env),
		request: event.request,
		prefix: photoPrefix(venue.id, access.show.id)
	});
	if (!done.ok) return json({ message: done.message }, { status: done.status });
	return json({ key: done.key }, { status: 201 });
};
