import { json } from '@sveltejs/kit';
import { and, eq } from 'drizzle-orm';
import { requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { sensors } from '$lib/server/db/schema';
import { getProp, isUuid } from '$lib/server/props/queries';
import { LIVE_WINDOW_S, lastHeard, sensorLive } from '$lib/server/boards/live';
import type { RequestHandler } from './$types';

// A sensor's live readings for its chart, polled every few seconds: ?after=<ms> gives only the
// seconds after the last ones the page has. Designers, owners and show managers; crew read their
// sensors' live readings on the checklist instead.
export const GET: RequestHandler = async (event) => {
	const venue = requireRole(event, 'owner', 'designer', 'show_manager');
	const prop = await getProp(db, venue.id, event.params.prop);
	if (!prop || !isUuid(event.params.sensor))
		return json({ message: 'There is no such sensor.' }, { status: 404 });
	const [sensor] = await db
		.select({ id: sensors.id })
		.from(sensors)
		.where(
			and(
				eq(sensors.id, event.params.sensor),
				eq(sensors.venueId, venue.id),
				eq(sensors.propId, prop.id)
			)
		);
	if (!sensor) return json({ message: 'There is no such sensor.' }, { status: 404 });
	const now = new Date();
	const raw = event.url.searchParams.get('after');
	const after = raw === null || raw === '' ? 0 : Number(raw);
	if (!Number.isFinite(after))
		return json(
			{ message: 'after must be a time in milliseconds since 1970, or left out.' },
			{ status: 400 }
		);
	const [live, heard] = await Promise.all([
		sensorLive(db, venue.id, sensor.id, { after, now }),
		prop.controllerId ? lastHeard(db, venue.id, prop.controllerId, now) : null
	]);
	return json({
		now: now.getTime(),
		windowS: LIVE_WINDOW_S,
		through: live.through,
		points: live.points.map((p) => [p.t, p.v]),
		latest: live.latest && { reading: live.latest.reading, at: live.latest.at.getTime() },
		heardAt: heard?.getTime() ?? null
	});
};
