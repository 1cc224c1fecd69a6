import { and, eq, inArray } from 'drizzle-orm';
import type { Db } from '$lib/server/db/client';
import { captures, propFiles, props, sensors } from '$lib/server/db/schema';

/**
 * Removing a prop, sensor, capture or file deletes its rows in one transaction and returns the
 * object-store keys that belonged to them; the caller deletes those objects only after the
 * transaction has committed (`discardObjects`), so a failing store never undoes a removal.
 *
 * Rows are locked FOR UPDATE first: an upload racing the removal then waits on its foreign-key
 * check and fails, instead of adding a capture whose object nobody would delete.
 */
export type Removal = { removed: boolean; keys: string[] };

type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

async function lockSensors(tx: Tx, venueId: string, where: ReturnType<typeof and>) {
	const rows = await tx
		.select({ id: sensors.id })
		.from(sensors)
		.where(and(eq(sensors.venueId, venueId), where))
		.for('update');
	return rows.map((r) => r.id);
}

async function dropCaptures(tx: Tx, venueId: string, sensorIds: string[]) {
	if (!sensorIds.length) return [];
	const rows = await tx
		.delete(captures)
		.where(and(eq(captures.venueId, venueId), inArray(captures.sensorId, sensorIds)))
		.returning({ key: captures.objectKey });
	return rows.map((r) => r.key);
}

export function removeProp(db: Db, venueId: string, propId: string): Promise<Removal> {
	return db.transaction(async (tx) => {
		const [prop] = await tx
			.select({ id: props.id })
			.from(props)
			.where(and(eq(props.id, propId), eq(props.venueId, venueId)))
			.for('update');
		if (!prop) return { removed: false, keys: [] };
		const sensorIds = await lockSensors(tx, venueId, eq(sensors.propId, propId));
		const captureKeys = await dropCaptures(tx, venueId, sensorIds);
		const files = await tx
			.delete(propFiles)
			.where(and(eq(propFiles.venueId, venueId), eq(propFiles.propId, propId)))
			.returning({ key: propFiles.objectKey });
		await tx.delete(props).where(and(eq(props.id, propId), eq(props.venueId, venueId)));
		return { removed: true, keys: [...captureKeys, ...files.map((f) => f.key)] };
	});
}

export function removeSensor(
	db: Db,
	venueId: string,
	propId: string,
	sensorId: string
): Promise<Removal> {
	return db.transaction(async (tx) => {
		const ids = await lockSensors(
			tx,
			venueId,
			and(eq(sensors.id, sensorId), eq(sensors.propId, propId))
		);
		if (!ids.length) return { removed: false, keys: [] };
		const keys = await dropCaptures(tx, venueId, ids);
		await tx.delete(sensors).where(and(eq(sensors.id, sensorId), eq(sensors.venueId, venueId)));
		return { removed: true, keys };
	});
}

export async function removeCapture(
	db: Db,
	venueId: string,
	sensorId: string,
	captureId: string
): Promise<Removal> {
	const rows = await db
		.delete(captures)
		.where(
			and(
				eq(captures.id, captureId),
				eq(captures.venueId, venueId),
				eq(captures.sensorId, sensorId)
			)
		)
		.returning({ key: captures.objectKey });
	return { removed: rows.length > 0, keys: rows.map((r) => r.key) };
}

export async function removePropFile(
	db: Db,
	venueId: string,
	propId: string,
	fileId: string
): Promise<Removal> {
	const rows = await db
		.delete(propFiles)
		.where(
			and(eq(propFiles.id, fileId), eq(propFiles.venueId, venueId), eq(propFiles.propId, propId))
		)
		.returning({ key: propFiles.objectKey });
	return { removed: rows.length > 0, keys: rows.map((r) => r.key) };
}
