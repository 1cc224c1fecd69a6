import { error } from '@sveltejs/kit';
import { and, eq } from 'drizzle-orm';
import { Readable } from 'node:stream';
import { env } from '$env/dynamic/private';
import { requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { checkResults } from '$lib/server/db/schema';
import { showAccess } from '$lib/server/checklists/access';
import { isShowPhotoKey } from '$lib/server/checklists/record';
import { objectStore } from '$lib/server/objects';
import { isUuid } from '$lib/server/props/queries';
import type { RequestHandler } from './$types';

/** A check's photo, to the people who may see that show's checklist. */
export const GET: RequestHandler = async (event) => {
	const venue = requireRole(event);
	const access = await showAccess(db, venue, event.locals.person!.id, event.params.show);
	if (!access.ok) error(access.status, access.message);
	if (!isUuid(event.params.result)) error(404, 'There is no such photo.');
	const [row] = await db
		.select({ key: checkResults.photoKey })
		.from(checkResults)
		.where(
			and(
				eq(checkResults.id, event.params.result),
				eq(checkResults.showId, access.show.id),
				eq(checkResults.venueId, venue.id)
			)
		);
	// Only a key the server made for this show is served, whatever was stored.
	if (!row?.key || !isShowPhotoKey(row.key, venue.id, access.show.id))
		error(404, 'There is no such photo.');
	const found = await objectStore(env).find(row.key);
	if (!found) error(404, 'That photo was never stored, or has been removed. Take it again.');
	const { body, size } = found;
	const ext = row.key.split('.').pop();
	const type = ext === 'png' ? 'image/png' : ext === 'webp' ? 'image/webp' : 'image/jpeg';
	return new Response(Readable.toWeb(body) as ReadableStream, {
		headers: {
			'content-type': type,
			...(size ? { 'content-length': String(size) } : {}),
			'x-content-type-options': 'nosniff',
			'cache-control': 'private, max-age=300'
		}
	});
};
