import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { recordResult } from '$lib/server/checklists/record';
import { unstorableErrors } from '$lib/server/text';
import type { RequestHandler } from './$types';

/**
 * Record one check result (JSON: clientId, checkId, outcome or idleReading and presentReading,
 * note, photoKey). 201 when stored, 200 with the stored result when the clientId was seen before.
 */
export const POST: RequestHandler = async (event) => {
	const venue = requireRole(event);
	const body = await event.request.json().catch(() => null);
	if (!body || typeof body !== 'object')
		return json({ message: 'Send the result as JSON.' }, { status: 400 });
	const unstorable = unstorableErrors(body);
	if (unstorable)
		return json({ message: 'Some fields need fixing.', errors: unstorable }, { status: 400 });
	const done = await recordResult(db, {
		venue,
		personId: event.locals.person!.id,
		showId: event.params.show,
		body
	});
	if (!done.ok)
		return json({ message: done.message, errors: done.errors ?? {} }, { status: done.status });
	const { photoKey, ...result } = done.result;
	return json(
		{ result: { ...result, hasPhoto: photoKey !== null }, replay: done.replay },
		{ status: done.replay ? 200 : 201 }
	);
};
