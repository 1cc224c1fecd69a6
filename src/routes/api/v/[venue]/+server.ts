import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import type { RequestHandler } from './$types';

/** The venue as its member sees it: name, kind and time zone, with the member's role. */
export const GET: RequestHandler = async (event) => {
	// The session hook read the venue and the membership with the session: nothing more to read.
	const venue = requireRole(event);
	return json({
		venue: {
			slug: venue.slug,
			name: venue.name,
			kind: venue.kind,
			timeZone: venue.timeZone,
			role: venue.role
		}
	});
};
