import { and, eq, isNull } from 'drizzle-orm';
import { calibrate } from '../calibration/calibrate';
import type { Db } from './db/client';
import { props, sensors } from './db/schema';
import type { SensorCalibration } from './db/props.schema';

// An invented calibration for the trail's well-lip plate, so show nights have a sensor test with a
// real band. Only set when the sensor has none, so loading twice changes nothing.
export async function seedDemoCalibration(db: Db, venueId: string, slug: string) {
	if (slug !== 'hollow-pines-trail') return;
	const [well] = await db
		.select({ id: sensors.id })
		.from(sensors)
		.innerJoin(props, eq(props.id, sensors.propId))
		.where(and(eq(props.venueId, venueId), eq(props.name, 'Hand in the well')));
	if (!well) return;

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
		.where(and(eq(sensors.id, well.id), isNull(sensors.calibration)));
}
