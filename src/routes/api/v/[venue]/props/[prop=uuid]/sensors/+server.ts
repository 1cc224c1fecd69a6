import { json } from '@sveltejs/kit';
import { EDITORS, requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { sensors } from '$lib/server/db/schema';
import { readJson } from '$lib/server/props/api';
import { getProp } from '$lib/server/props/queries';
import { sensorValues, touchProp } from '$lib/server/props/records';
import { sensorSchema } from '$lib/schemas/sensor';
import type { RequestHandler } from './$types';

/** Body: { name, settings: { kind, …that kind's fields }, range: { near, far, hysteresis, debounceMs, rearmMs } }. */
export const POST: RequestHandler = async (event) => {
	const venue = requireRole(event, ...EDITORS);
	const prop = await getProp(db, venue.id, event.params.prop);
	if (!prop) return json({ message: 'There is no such prop.' }, { status: 404 });
	const body = await readJson(event.request, sensorSchema);
	if (!body.ok) return body.response;
	const [row] = await db
		.insert(sensors)
		.values({ ...sensorValues(body.data), venueId: venue.id, propId: prop.id })
		.returning();
	await touchProp(db, venue.id, prop.id);
	return json({ sensor: row }, { status: 201 });
};
