import { error } from '@sveltejs/kit';
import { and, eq } from 'drizzle-orm';
import { Readable } from 'node:stream';
import { env } from '$env/dynamic/private';
import { requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { propFiles } from '$lib/server/db/schema';
import { objectStore } from '$lib/server/objects';
import { isUuid } from '$lib/server/props/queries';
import type { RequestHandler } from './$types';

/** Photos and wiring files, served only to members of the venue that owns them. */
export const GET: RequestHandler = async (event) => {
	const venue = requireRole(event);
	if (!isUuid(event.params.file) || !isUuid(event.params.prop))
		error(404, 'There is no such file.');
	const [file] = await db
		.select()
		.from(propFiles)
		.where(
			and(
				eq(propFiles.id, event.params.file),
				eq(propFiles.venueId, venue.id),
				eq(propFiles.propId, event.params.prop)
			)
		);
	if (!file) error(404, 'There is no such file.');
	const found = await objectStore(env).find(file.objectKey);
	if (!found) error(404, 'That file is no longer stored. Upload it again.');
	const { body } = found;
	return new Response(Readable.toWeb(body) as ReadableStream, {
		headers: {
			'content-type': file.contentType,
			'content-length': String(file.sizeBytes),
			'content-disposition': `${file.kind === 'photo' ? 'inline' : 'attachment'}; filename="${file.filename.replace(/"/g, '')}"`,
			'x-content-type-options': 'nosniff',
			'cache-control': 'private, max-age=300'
		}
	});
};
