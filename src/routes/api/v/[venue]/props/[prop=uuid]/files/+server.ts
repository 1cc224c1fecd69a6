import { json } from '@sveltejs/kit';
import { and, asc, eq } from 'drizzle-orm';
import { env } from '$env/dynamic/private';
import { EDITORS, requireRole } from '$lib/server/auth/guard';
import { audit } from '$lib/server/audit';
import { db } from '$lib/server/db';
import { propFiles } from '$lib/server/db/schema';
import { objectStore } from '$lib/server/objects';
import { getProp } from '$lib/server/props/queries';
import { ingestPropFile } from '$lib/server/props/uploads';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	const venue = requireRole(event);
	const prop = await getProp(db, venue.id, event.params.prop);
	if (!prop) return json({ message: 'There is no such prop.' }, { status: 404 });
	const list = await db
		.select()
		.from(propFiles)
		.where(and(eq(propFiles.venueId, venue.id), eq(propFiles.propId, prop.id)))
		.orderBy(asc(propFiles.uploadedAt));
	return json({ files: list.map(({ objectKey: _key, ...f }) => f) });
};

/** The body is the file itself; ?filename= names it. The type is read from its content. */
export const POST: RequestHandler = async (event) => {
	const venue = requireRole(event, ...EDITORS);
	const result = await ingestPropFile({
		db,
		store: objectStore(env),
		request: event.request,
		venueId: venue.id,
		propId: event.params.prop,
		personId: event.locals.person!.id,
		filename: event.url.searchParams.get('filename')
	});
	if (!result.ok) return json({ message: result.message }, { status: result.status });
	await audit(db, {
		venueId: venue.id,
		personId: event.locals.person!.id,
		action: 'prop.file_uploaded',
		detail: { file: result.file.filename, propId: event.params.prop }
	});
	const { objectKey: _key, ...file } = result.file;
	return json({ file }, { status: 201 });
};
