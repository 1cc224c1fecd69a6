import { json } from '@sveltejs/kit';
import { eq } from 'drizzle-orm';
import { requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { venues } from '$lib/server/db/schema';
import type { RequestHandler } from './$types';

/** The venue as its member sees it: name, kind and time zone, with the member's role. */
export const GET: RequestHandler = async (event) => {
	const venue = requireRole(event);
	const [row] = await db
		.select({ name: venues.name, kind: venues.kind, timeZone: venues.timeZone })
		.from(venues)
		.where(eq(venues.id, venue.id))
		.limit(1);
	if (!row)
		return json(
			{ message: 'There is no such venue, or you are not a member of it.' },
			{ status: 404 }
		);
	return json({ venue: { slug: venue.slug, ...row, role: venue.role } });
};
