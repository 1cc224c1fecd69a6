import { error, fail } from '@sveltejs/kit';
import { and, desc, eq, isNull } from 'drizzle-orm';
import { z } from 'zod';
import { EDITORS, requireRole } from '$lib/server/auth/guard';
import { audit } from '$lib/server/audit';
import { db } from '$lib/server/db';
import { boardKeys, captures, sensors, type SensorCalibration } from '$lib/server/db/schema';
import { parseForm } from '$lib/server/forms';
import { parseNestedForm } from '$lib/server/props/form';
import { getController, getProp, isUuid } from '$lib/server/props/queries';
import { sensorFormValues, sensorValues, touchProp } from '$lib/server/props/records';
import type { StoredCaptureSummary } from '$lib/server/props/uploads';
import { checkReason, lastSignedNight, recordChange } from '$lib/server/changes/records';
import { localDay } from '$lib/util/when';
import { RANGE_FIELDS } from '$lib/components/props/sensor-defaults';
import { differences, sensorDifferences, sensorState } from '$lib/props/changes';
import { sensorSchema } from '$lib/schemas/sensor';
import { env } from '$env/dynamic/private';
import { objectStore } from '$lib/server/objects';
import { discardObjects } from '$lib/server/object-cleanup';
import { removeCapture } from '$lib/server/props/removal';
import {
	BASELINE_WINDOW_WORDS,
	baselineWords,
	judgeNights,
	nightlyBaselines
} from '$lib/server/boards/baselines';
import { figure } from '$lib/quantity';
import type { Actions, PageServerLoad, RequestEvent } from './$types';

/** The baseline history shows this many of the latest nights with readings: a season or two. */
const HISTORY_NIGHTS = 90;

async function find(event: RequestEvent | Parameters<PageServerLoad>[0], venueId: string) {
	const prop = await getProp(db, venueId, event.params.prop);
	if (!prop || !isUuid(event.params.sensor)) error(404, 'There is no such sensor in this venue.');
	const [sensor] = await db
		.select()
		.from(sensors)
		.where(
			and(
				eq(sensors.id, event.params.sensor),
				eq(sensors.venueId, venueId),
				eq(sensors.propId, prop.id)
			)
		);
	if (!sensor) error(404, 'There is no such sensor in this venue.');
	return { prop, sensor };
}

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event);
	const { prop, sensor } = await find(event, venue.id);
	const [controller, list, keys, signed, nights] = await Promise.all([
		getController(db, venue.id, prop.controllerId),
		db
			.select()
			.from(captures)
			.where(and(eq(captures.venueId, venue.id), eq(captures.sensorId, sensor.id)))
			.orderBy(desc(captures.uploadedAt)),
		prop.controllerId
			? db
					.select({ id: boardKeys.id })
					.from(boardKeys)
					.where(
						and(
							eq(boardKeys.venueId, venue.id),
							eq(boardKeys.controllerId, prop.controllerId),
							isNull(boardKeys.revokedAt)
						)
					)
					.limit(1)
			: [],
		lastSignedNight(db, venue.id, prop.id),
		nightlyBaselines(db, venue.id, [sensor.id], {}).then((all) => all.slice(-HISTORY_NIGHTS))
	]);
	const last = nights.at(-1);
	const judged = last ? judgeNights(nights, sensor.id, last.showId, sensor.calibration) : null;
	const wanted = event.url.searchParams.get('capture');
	const shown = list.find((c) => c.id === wanted) ?? list[0] ?? null;
	return {
		prop,
		sensor,
		formValues: sensorFormValues(sensor),
		controller,
		captures: list.map((c) => ({
			id: c.id,
			filename: c.filename,
			sizeBytes: c.sizeBytes,
			sha256: c.sha256,
			rows: c.rows,
			idleRows: c.idleRows,
			presentRows: c.presentRows,
			uploadedAt: c.uploadedAt,
			idleMean: (c.summary as unknown as StoredCaptureSummary).idle.mean,
			idleSigma: (c.summary as unknown as StoredCaptureSummary).idle.sigma
		})),
		shown: shown
			? {
					id: shown.id,
					filename: shown.filename,
					summary: shown.summary as unknown as StoredCaptureSummary
				}
			: null,
		signedNight: signed ? localDay(signed.date) : null,
		canEdit: EDITORS.includes(venue.role),
		// The live readings' endpoint serves designers, owners and show managers.
		canSeeLive: venue.role !== 'crew',
		boardHasKey: keys.length > 0,
		baselines: {
			window: BASELINE_WINDOW_WORDS,
			nights: nights.map((n) => ({
				day: localDay(n.date),
				date: n.date,
				baseline: n.baseline,
				shown: figure(n.baseline),
				readings: n.readings
			})),
			/** What the latest night's baseline says against the band; null when nothing to say. */
			words: judged ? baselineWords(judged, sensor.calibration) : null,
			state: judged?.state ?? 'unknown',
			lastDay: last ? localDay(last.date) : null
		},
		timeZone: venue.timeZone
	};
};

export const actions: Actions = {
	save: async (event) => {
		const venue = requireRole(event, ...EDITORS);
		const { prop, sensor } = await find(event, venue.id);
		const parsed = await parseNestedForm(event.request, sensorSchema);
		if (!parsed.ok) return fail(400, { action: 'save', values: parsed.raw, errors: parsed.errors });
		const values = sensorValues(parsed.data);
		const diffs = sensorDifferences(sensor, values);
		const gate = await checkReason(db, venue.id, prop.id, diffs, parsed.raw);
		if (!gate.ok) return fail(400, { action: 'save', values: parsed.raw, errors: gate.errors });
		await db.transaction(async (tx) => {
			await tx
				.update(sensors)
				.set(values)
				.where(and(eq(sensors.id, sensor.id), eq(sensors.venueId, venue.id)));
			if (gate.reason)
				await recordChange(tx, {
					venueId: venue.id,
					propId: prop.id,
					sensorId: sensor.id,
					part: 'sensor',
					partName: values.name,
					diffs,
					oldValue: sensorState(sensor),
					newValue: sensorState(values),
					reason: gate.reason,
					personId: event.locals.person!.id
				});
		});
		await touchProp(db, venue.id, prop.id);
		return { action: 'save', saved: true };
	},
	apply: async (event) => {
		const venue = requireRole(event, ...EDITORS);
		const { prop, sensor } = await find(event, venue.id);
		const parsed = await parseForm(event.request, z.object({ captureId: z.uuid() }));
		if (!parsed.ok) return fail(400, { action: 'apply', message: 'Choose a capture first.' });
		const [capture] = await db
			.select()
			.from(captures)
			.where(
				and(
					eq(captures.id, parsed.data.captureId),
					eq(captures.venueId, venue.id),
					eq(captures.sensorId, sensor.id)
				)
			);
		const cal = (capture?.summary as unknown as StoredCaptureSummary | undefined)?.calibration;
		if (!cal)
			return fail(400, {
				action: 'apply',
				message: 'That capture has no calibration: it needs both idle and present readings.'
			});
		// The trigger range is a setting people read and edit, so it takes the suggestion to four
		// significant figures (well inside a reading's noise); the calibration keeps full precision.
		const setting = (v: number) => Number(v.toPrecision(4));
		const range = {
			near: setting(cal.depth.near),
			far: setting(cal.depth.far),
			hysteresis: setting(Math.abs(cal.enter - cal.exit))
		};
		const calibration: SensorCalibration = {
			direction: cal.direction,
			enter: cal.enter,
			exit: cal.exit,
			baselineLow: cal.baselineBand.low,
			baselineHigh: cal.baselineBand.high,
			captureId: capture.id,
			appliedAt: new Date().toISOString()
		};
		const diffs = differences(RANGE_FIELDS, sensor, range);
		const gate = await checkReason(db, venue.id, prop.id, diffs, parsed.raw);
		if (!gate.ok)
			return fail(400, {
				action: 'apply',
				values: parsed.raw,
				errors: gate.errors,
				message: gate.errors.changeReason[0]
			});
		await db.transaction(async (tx) => {
			await tx
				.update(sensors)
				.set({ ...range, calibration })
				.where(and(eq(sensors.id, sensor.id), eq(sensors.venueId, venue.id)));
			if (gate.reason)
				await recordChange(tx, {
					venueId: venue.id,
					propId: prop.id,
					sensorId: sensor.id,
					part: 'trigger_range',
					partName: sensor.name,
					diffs,
					oldValue: { near: sensor.near, far: sensor.far, hysteresis: sensor.hysteresis },
					newValue: { ...range, capture: capture.filename },
					reason: gate.reason,
					personId: event.locals.person!.id
				});
		});
		await touchProp(db, venue.id, prop.id);
		await audit(db, {
			venueId: venue.id,
			personId: event.locals.person!.id,
			action: 'sensor.calibrated',
			detail: { sensor: sensor.name, capture: capture.filename, ...range }
		});
		return { action: 'apply', applied: true };
	},
	removeCapture: async (event) => {
		const venue = requireRole(event, ...EDITORS);
		const { sensor } = await find(event, venue.id);
		const parsed = await parseForm(event.request, z.object({ captureId: z.uuid() }));
		if (!parsed.ok)
			return fail(400, { action: 'removeCapture', message: 'That capture does not exist.' });
		const removal = await removeCapture(db, venue.id, sensor.id, parsed.data.captureId);
		if (!removal.removed)
			return fail(404, { action: 'removeCapture', message: 'That capture was already removed.' });
		await discardObjects(objectStore(env), removal.keys);
		await audit(db, {
			venueId: venue.id,
			personId: event.locals.person!.id,
			action: 'capture.removed',
			detail: { sensor: sensor.name }
		});
		return { action: 'removeCapture', removed: true };
	}
};
