import { json } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import { requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { checkPhotos } from '$lib/server/db/schema';
import { showAccess } from '$lib/server/checklists/access';
import { photoPrefix } from '$lib/server/checklists/record';
import { objectStore } from '$lib/server/objects';
import { ingestCheckPhoto } from '$lib/server/props/uploads';
import type { RequestHandler } from './$types';

const TYPES: Record<string, string> = { png: 'image/png', jpg: 'image/jpeg', webp: 'image/webp' };

/** The body is the photo itself; the answer's photoId goes with the result that uses it. */
export const POST: RequestHandler = async (event) => {
	const venue = requireRole(event);
	const access = await showAccess(db, venue, event.locals.person!.id, event.params.show);
	if (!access.ok) return json({ message: access.message }, { status: access.status });
	const store = objectStore(env);
	const done = await ingestCheckPhoto({
		store,
		request: event.request,
		prefix: photoPrefix(venue.id, access.show.id)
	});
	if (!done.ok) return json({ message: done.message }, { status: done.status });
	const ext = done.key.split('.').pop() ?? '';
	try {
		const [row] = await db
			.insert(checkPhotos)
			.values({
				venueId: venue.id,
				showId: access.show.id,
				key: done.key,
				contentType: TYPES[ext] ?? 'image/jpeg',
				personId: event.locals.person!.id
			})
			.returning({ id: checkPhotos.id });
		return json({ photoId: row.id }, { status: 201 });
	} catch (e) {
		await store.remove(done.key).catch(() => {});
		throw e;
	}
};
