import { error } from '@sveltejs/kit';
import { and, asc, eq } from 'drizzle-orm';
import { EDITORS, requireRole } from '$lib/server/auth/guard';
import { config } from '$lib/server/config';
import { db } from '$lib/server/db';
import { outputs, props, sensors } from '$lib/server/db/schema';
import { getController } from '$lib/server/props/queries';
import { firmwareHeader, headerFileName } from '$lib/boards/firmware-header';
import { localDateTime } from '$lib/util/when';
import type { RequestHandler } from './$types';

// The controller's firmware header (designers and owners, who flash the boards). It holds no key.
export const GET: RequestHandler = async (event) => {
	const venue = requireRole(event, ...EDITORS);
	const controller = await getController(db, venue.id, event.params.controller);
	if (!controller) error(404, 'There is no such controller in this venue.');
	const onBoard = and(eq(props.venueId, venue.id), eq(props.controllerId, controller.id));
	const [sensorRows, outputRows] = await Promise.all([
		db
			.select({
				name: sensors.name,
				kind: sensors.kind,
				settings: sensors.settings,
				near: sensors.near,
				far: sensors.far,
				hysteresis: sensors.hysteresis,
				debounceMs: sensors.debounceMs,
				rearmMs: sensors.rearmMs,
				calibration: sensors.calibration
			})
			.from(sensors)
			.innerJoin(props, eq(props.id, sensors.propId))
			.where(and(onBoard, eq(sensors.venueId, venue.id)))
			.orderBy(asc(props.name), asc(sensors.name)),
		db
			.select({ name: outputs.name, kind: outputs.kind, curve: outputs.curve })
			.from(outputs)
			.innerJoin(props, eq(props.id, outputs.propId))
			.where(and(onBoard, eq(outputs.venueId, venue.id)))
			.orderBy(asc(props.name), asc(outputs.name))
	]);
	const text = firmwareHeader({
		venueName: venue.name,
		controller,
		sensors: sensorRows.map((s) => ({
			...s,
			settings: s.settings as unknown as Record<string, unknown> & { kind: string }
		})),
		outputs: outputRows,
		broker: config.boardBroker,
		madeAt: localDateTime(new Date(), venue.timeZone, venue.clock)
	});
	return new Response(text, {
		headers: {
			'content-type': 'text/x-c; charset=utf-8',
			'content-disposition': `attachment; filename="${headerFileName(controller.name)}"`
		}
	});
};
