import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { showAccess } from '$lib/server/checklists/access';
import { PRESENT_SECONDS, boardIdles, boardPeak } from '$lib/server/boards/checks';
import type { RequestHandler } from './$types';

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/**
 * What the boards say for the night's sensor tests, for whoever may work the checklist.
 *   (nothing)                 each live sensor test's idle reading now, by check id
 *   ?check=…                  that check's idle reading up to now: the press of the button
 *   ?check=…&from=ms          the peak of that check's readings from `from` for PRESENT_SECONDS
 * Always with the server's time now, which the phone counts the window against.
 */
export const GET: RequestHandler = async (event) => {
	const venue = requireRole(event);
	const access = await showAccess(db, venue, event.locals.person!.id, event.params.show);
	if (!access.ok) return json({ message: access.message }, { status: access.status });
	const headers = { 'cache-control': 'no-store' };
	const now = new Date();
	const q = event.url.searchParams;
	const checkId = q.get('check');
	if (checkId !== null && !UUID.test(checkId))
		return json({ message: 'That check is not on this night’s list.' }, { status: 404, headers });
	const fromText = q.get('from');
	if (fromText === null) {
		const idles = await boardIdles(db, venue.id, access.show.id, {
			before: now,
			checkId: checkId ?? undefined
		});
		return json({ now: now.getTime(), idles, presentSeconds: PRESENT_SECONDS }, { headers });
	}
	const from = Number(fromText);
	if (!checkId || !Number.isFinite(from) || Math.abs(now.getTime() - from) > 3_600_000)
		return json(
			{ message: 'Press the button again: the reading window was not understood.' },
			{ status: 400, headers }
		);
	const to = new Date(from + PRESENT_SECONDS * 1000);
	const peak = await boardPeak(db, venue.id, access.show.id, checkId, { from: new Date(from), to });
	return json({ now: now.getTime(), peak, complete: now.getTime() >= to.getTime() }, { headers });
};
