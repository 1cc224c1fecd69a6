import { error, json } from '@sveltejs/kit';
import { z } from 'zod';
import { PLANNERS, requireRole } from '$lib/server/auth/guard';
import { and, eq } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { shows } from '$lib/server/db/schema';
import { runSheetDelivery } from '$lib/server/runsheets/send';
import type { RequestHandler } from './$types';

/** Where each person's run sheet for a show is: queued, sent or failed (the show page polls it). */
export const GET: RequestHandler = async (event) => {
	const venue = requireRole(event, ...PLANNERS);
	if (!z.uuid().safeParse(event.params.show).success) error(404, 'There is no such show.');
	const [show] = await db
		.select({ id: shows.id })
		.from(shows)
		.where(and(eq(shows.id, event.params.show), eq(shows.venueId, venue.id)));
	if (!show) error(404, 'There is no such show.');
	return json(await runSheetDelivery(db, venue.id, event.params.show));
};
