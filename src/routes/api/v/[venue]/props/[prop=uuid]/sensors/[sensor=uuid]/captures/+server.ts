import { json } from '@sveltejs/kit';
import { and, desc, eq } from 'drizzle-orm';
import { env } from '$env/dynamic/private';
import { EDITORS, requireRole } from '$lib/server/auth/guard';
import { audit } from '$lib/server/audit';
import { db } from '$lib/server/db';
import { captures, sensors } from '$lib/server/db/schema';
import { objectStore } from '$lib/server/objects';
import { getController, getProp, isUuid } from '$lib/server/props/queries';
import { ingestCapture } from '$lib/server/props/uploads';
import { plateOnController } from '$lib/electronics';
import type { RequestHandler } from './$types';

async function findSensor(venueId: string, propId: string, sensorId: string) {
	const prop = await getProp(db, venueId, propId);
	if (!prop || !isUuid(sensorId)) return null;
	const [sensor] = await db
		.select()
		.from(sensors)
		.where(
			and(eq(sensors.id, sensorId), eq(sensors.venueId, venueId), eq(sensors.propId, prop.id))
		);
	return sensor ? { prop, sensor } : null;
}

export const GET: RequestHandler = async (event) => {
	const venue = requireRole(event);
	const found = await findSensor(venue.id, event.params.prop, event.params.sensor);
	if (!found) return json({ message: 'There is no such sensor.' }, { status: 404 });
	const list = await db
		.select()
		.from(captures)
		.where(and(eq(captures.venueId, venue.id), eq(captures.sensorId, found.sensor.id)))
		.orderBy(desc(captures.uploadedAt));
	return json({ captures: list.map(({ objectKey: _key, ...c }) => c) });
};

/** The body is the CSV itself, streamed; ?filename= names it. */
export const POST: RequestHandler = async (event) => {
	const venue = requireRole(event, ...EDITORS);
	const found = await findSensor(venue.id, event.params.prop, event.params.sensor);
	if (!found) return json({ message: 'There is no such sensor.' }, { status: 404 });
	// A capture without times is placed in time at the plate maths' update rate; a timed one at its own.
	let updateRateHz: number | null = null;
	const s = found.sensor.settings;
	const controller = await getController(db, venue.id, found.prop.controllerId);
	if (s.kind === 'capacitive' && controller) {
		const plate = plateOnController(s, controller);
		if (plate.ok) updateRateHz = plate.value.updateRateHz;
	}
	const result = await ingestCapture({
		db,
		store: objectStore(env),
		request: event.request,
		venueId: venue.id,
		sensorId: found.sensor.id,
		personId: event.locals.person!.id,
		filename: event.url.searchParams.get('filename'),
		updateRateHz
	});
	if (!result.ok)
		return json({ message: result.message, line: result.line ?? null }, { status: result.status });
	await audit(db, {
		venueId: venue.id,
		personId: event.locals.person!.id,
		action: 'capture.uploaded',
		detail: { sensor: found.sensor.name, file: result.capture.filename, rows: result.capture.rows }
	});
	const { objectKey: _key, ...capture } = result.capture;
	return json({ capture }, { status: 201 });
};
