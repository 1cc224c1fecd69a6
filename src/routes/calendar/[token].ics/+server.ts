import { error } from '@sveltejs/kit';
import { db } from '$lib/server/db';
import { feedCalendar } from '$lib/server/schedule/feeds';
import type { RequestHandler } from './$types';
import { config } from '$lib/server/config';

// Public: the unguessable token in the address is the permission; only its hash is stored.
export const GET: RequestHandler = async (event) => {
	const ics = await feedCalendar(db, event.params.token, config.origin);
	if (ics === null)
		error(404, 'This calendar link does not work any more. Make a new one in Gloaming.');
	return new Response(ics, {
		headers: {
			'content-type': 'text/calendar; charset=utf-8',
			'cache-control': 'private, max-age=300'
		}
	});
};
