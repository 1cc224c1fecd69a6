import { and, asc, eq, isNull } from 'drizzle-orm';
import { calibrate } from '../calibration/calibrate';
import type { Db } from './db/client';
import { props, readingMinutes, sensors, shows, venues } from './db/schema';
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

/**
 * Invented per-minute figures for the well-lip plate in the hour before doors on the trail's first
 * twelve nights, so its baseline history has a season to show: steady at first, then creeping up
 * towards the top of its band. A minute already there is left as it is.
 */
export async function seedDemoBaselines(db: Db, slug: string) {
	const [venue] = await db.select({ id: venues.id }).from(venues).where(eq(venues.slug, slug));
	if (!venue) return;
	const venueId = venue.id;
	const [well] = await db
		.select({ id: sensors.id, calibration: sensors.calibration })
		.from(sensors)
		.innerJoin(props, eq(props.id, sensors.propId))
		.where(and(eq(props.venueId, venueId), eq(props.name, 'Hand in the well')));
	const cal = well?.calibration;
	if (!cal) return;
	const nights = await db
		.select({ doorsOpen: shows.doorsOpen })
		.from(shows)
		.where(and(eq(shows.venueId, venueId), eq(shows.status, 'scheduled')))
		.orderBy(asc(shows.doorsOpen))
		.limit(12);
	const mid = (cal.baselineLow + cal.baselineHigh) / 2;
	const half = (cal.baselineHigh - cal.baselineLow) / 2;
	// Small fixed wobbles, so the line is not ruled straight.
	const wobble = [0.04, -0.06, 0.02, -0.03, 0.05, -0.02, 0.03, -0.04, 0.01, 0.03, -0.02, 0.02];
	const rows = nights.flatMap((n, i) => {
		const creep = i < 5 ? 0 : (i - 4) * 0.22;
		const mean = mid + half * (-0.1 + creep + wobble[i]);
		return Array.from({ length: 6 }, (_, k) => ({
			venueId,
			sensorId: well.id,
			minute: new Date(n.doorsOpen.getTime() - (55 - k * 10) * 60_000),
			count: 600,
			mean: Number((mean + (k - 2.5) * 0.02).toFixed(3)),
			sigma: 3,
			min: Number((mean - 4).toFixed(2)),
			max: Number((mean + 4).toFixed(2)),
			lastSeq: 0
		}));
	});
	if (rows.length) await db.insert(readingMinutes).values(rows).onConflictDoNothing();
}
