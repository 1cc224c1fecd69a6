import { and, eq, isNull } from 'drizzle-orm';
import { calibrate } from '../calibration/calibrate';
import type { Db } from './db/client';
import { outputs, props, rooms, sceneCues, sceneResponses, scenes, sensors } from './db/schema';
import type { SensorCalibration } from './db/props.schema';

// Invented demo scenes and a calibration for the trail, so show nights have a checklist.
// Named "Well glow" and "Gate hiss"; matched by name, so loading twice changes nothing.

async function find(db: Db, venueId: string, prop: string) {
	const [p] = await db
		.select()
		.from(props)
		.where(and(eq(props.venueId, venueId), eq(props.name, prop)));
	if (!p) return null;
	const [s] = await db.select().from(sensors).where(eq(sensors.propId, p.id));
	const [o] = await db.select().from(outputs).where(eq(outputs.propId, p.id));
	return { prop: p, sensor: s ?? null, output: o ?? null };
}

export async function seedDemoScenes(db: Db, venueId: string, slug: string) {
	if (slug !== 'hollow-pines-trail') return;
	const well = await find(db, venueId, 'Hand in the well');
	const drop = await find(db, venueId, 'Barn-loft drop');
	if (!well?.sensor || !well.output || !drop?.output) return;

	// An invented capture: idle about 1480 counts, a hand brings it to about 1560.
	const cal = calibrate({
		idle: { count: 600, mean: 1480, sigma: 3 },
		present: { count: 300, mean: 1560, sigma: 6 },
		updateRateHz: 40
	});
	const calibration: SensorCalibration = {
		direction: cal.direction,
		enter: cal.enter,
		exit: cal.exit,
		baselineLow: cal.baselineBand.low,
		baselineHigh: cal.baselineBand.high,
		captureId: null,
		appliedAt: '2027-09-20T18:00:00.000Z'
	};
	await db
		.update(sensors)
		.set({
			calibration,
			near: cal.depth.near,
			far: cal.depth.far,
			hysteresis: Math.abs(cal.enter - cal.exit)
		})
		.where(and(eq(sensors.id, well.sensor.id), isNull(sensors.calibration)));

	const roomId = async (name: string) =>
		(
			await db
				.select({ id: rooms.id })
				.from(rooms)
				.where(and(eq(rooms.venueId, venueId), eq(rooms.name, name)))
		)[0]?.id ?? null;

	const [glow] = await db
		.insert(scenes)
		.values({
			venueId,
			roomId: await roomId('Lantern Walk'),
			name: 'Well glow',
			trigger: 'sensor',
			triggerSensorId: well.sensor.id,
			lengthMs: 8000,
			rearmMs: 1500,
			notes: 'The lanterns below the well swell as a hand reaches in.'
		})
		.onConflictDoNothing()
		.returning();
	if (glow)
		await db.insert(sceneResponses).values({
			venueId,
			sceneId: glow.id,
			sensorId: well.sensor.id,
			outputId: well.output.id,
			shape: 'rise',
			minLevel: 0.1,
			maxLevel: 1
		});

	const [hiss] = await db
		.insert(scenes)
		.values({
			venueId,
			roomId: await roomId('Hollow Barn'),
			name: 'Gate hiss',
			trigger: 'timer',
			loopMs: 120_000,
			lengthMs: 4000,
			rearmMs: 0,
			notes: 'A short blast from the loft valve every two minutes.'
		})
		.onConflictDoNothing()
		.returning();
	if (hiss)
		await db.insert(sceneCues).values({
			venueId,
			sceneId: hiss.id,
			outputId: drop.output.id,
			startMs: 500,
			action: { type: 'pulse', durationMs: 250 }
		});
}
