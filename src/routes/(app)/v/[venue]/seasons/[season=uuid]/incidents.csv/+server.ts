import { error } from '@sveltejs/kit';
import { and, eq } from 'drizzle-orm';
import { PLANNERS, requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { seasons } from '$lib/server/db/schema';
import { incidentsCsv } from '$lib/server/incidents/csv';
import { listIncidents, seasonShowIds } from '$lib/server/incidents/records';
import type { RequestHandler } from './$types';

/** A season's incidents as CSV, for show managers and owners. */
export const GET: RequestHandler = async (event) => {
	const venue = requireRole(event, ...PLANNERS);
	const [season] = await db
		.select({ id: seasons.id, name: seasons.name })
		.from(seasons)
		.where(and(eq(seasons.id, event.params.season), eq(seasons.venueId, venue.id)));
	if (!season) error(404, 'There is no such season in this venue.');
	const list = await listIncidents(db, venue.id, {
		showIds: await seasonShowIds(db, venue.id, season.id)
	});
	// Header values are ASCII: the plain name keeps letters and digits, the encoded one the rest.
	const named = (keepChars: RegExp) =>
		`${season.name.replace(keepChars, '-').replace(/^-+|-+$/g, '') || 'season'}-incidents.csv`;
	const file = named(/[^A-Za-z0-9]+/g);
	const full = named(/[^\p{L}\p{N}]+/gu);
	return new Response(incidentsCsv(list, venue.timeZone), {
		headers: {
			'content-type': 'text/csv; charset=utf-8',
			'content-disposition': `attachment; filename="${file}"; filename*=UTF-8''${encodeURIComponent(full)}`,
			'cache-control': 'private, no-store'
		}
	});
};
