import { json } from '@sveltejs/kit';
import { eq } from 'drizzle-orm';
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
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/**
 * The body is the photo itself; the answer's photoId goes with the result that uses it. With
 * ?clientId= (made by the phone) a photo sent again after a dropped connection is stored once:
 * the second upload answers 200 with the first one's photoId.
 */
export const POST: RequestHandler = async (event) => {
	const venue = requireRole(event);
	const personId = event.locals.person!.id;
	const access = await showAccess(db, venue, personId, event.params.show);
	if (!access.ok) return json({ message: access.message }, { status: access.status });
	const clientId = event.url.searchParams.get('clientId');
	if (clientId !== null && !UUID.test(clientId))
		return json({ message: 'Each photo needs its own id from the phone.' }, { status: 400 });

	const earlier = async () => {
		if (!clientId) return null;
		const [row] = await db.select().from(checkPhotos).where(eq(checkPhotos.clientId, clientId));
		if (!row) return null;
		if (row.venueId === venue.id && row.showId === access.show.id && row.personId === personId)
			return json({ photoId: row.id, replay: true }, { status: 200 });
		return json({ message: 'That photo id was already used for another photo.' }, { status: 409 });
	};
	const seen = await earlier();
	if (seen) return seen;

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
				personId,
				clientId
			})
			.onConflictDoNothing({ target: checkPhotos.clientId })
			.returning({ id: checkPhotos.id });
		if (row) return json({ photoId: row.id, replay: false }, { status: 201 });
	} catch (e) {
		await store.remove(done.key).catch(() => {});
		throw e;
	}
	// The same photo arrived twice at once: the other request stored it; this copy goes.
	await store.remove(done.key).catch(() => {});
	return (
		(await earlier()) ??
		json({ message: 'The photo could not be stored; send it again.' }, { status: 409 })
	);
};
