import { and, eq, sql } from 'drizzle-orm';
import type { Db } from '$lib/server/db/client';
import { props, sensors } from '$lib/server/db/schema';
import { shortName, type WireReading } from '$lib/boards/wire';
import type { BoardKey } from './keys';

// Storing a batch of readings for one key. Either every reading in the batch names a sensor of the
// key's controller and the batch is stored, or nothing is. A (sensor, seq) already stored today or
// yesterday is skipped, so a board may resend a batch it is unsure about.

export type Stored =
	{ ok: true; stored: number; duplicates: number } | { ok: false; status: 422; message: string };

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** UTC 'YYYY-MM-DD'. */
const dayOf = (at: Date) => at.toISOString().slice(0, 10);

/** Days whose partition this process has seen exist, so each day asks once. */
const partitionsMade = new Set<string>();

/** After partitions are dropped: ask again. */
export function forgetPartitions() {
	partitionsMade.clear();
}

async function ensurePartition(db: Db, day: string) {
	if (partitionsMade.has(day)) return;
	await db.execute(sql`select readings_add_partitions(${day}::date, 2)`);
	partitionsMade.add(day);
}

/** The controller's sensors by id, name and short name; a name two sensors share is ambiguous. */
async function sensorIndex(db: Db, key: BoardKey) {
	const rows = await db
		.select({ id: sensors.id, name: sensors.name })
		.from(sensors)
		.innerJoin(props, eq(props.id, sensors.propId))
		.where(and(eq(sensors.venueId, key.venueId), eq(props.controllerId, key.controllerId)));
	const byName = new Map<string, string | null>();
	const byId = new Map<string, string>();
	for (const r of rows) {
		byId.set(r.id.toLowerCase(), r.id);
		for (const n of new Set([r.name.trim().toLowerCase(), shortName(r.name)]))
			byName.set(n, byName.has(n) && byName.get(n) !== r.id ? null : r.id);
	}
	return (s: string): string | null | undefined => {
		const t = s.toLowerCase();
		if (UUID.test(t)) return byId.get(t);
		return byName.get(t);
	};
}

export async function storeReadings(
	db: Db,
	key: BoardKey,
	readings: WireReading[],
	now = new Date()
): Promise<Stored> {
	const find = await sensorIndex(db, key);
	const unknown = new Set<string>();
	const ambiguous = new Set<string>();
	const ids: string[] = [];
	for (const r of readings) {
		const id = find(r.sensor);
		if (id === null) ambiguous.add(r.sensor);
		else if (id === undefined) unknown.add(r.sensor);
		else ids.push(id);
	}
	if (unknown.size || ambiguous.size) {
		const list = (s: Set<string>) => [...s].slice(0, 5).join(', ');
		return {
			ok: false,
			status: 422,
			message: unknown.size
				? `This board's controller has no sensor called ${list(unknown)}. Nothing was stored.`
				: `More than one sensor of this controller is called ${list(ambiguous)}: send the sensor's id. Nothing was stored.`
		};
	}
	const day = dayOf(now);
	await ensurePartition(db, day);
	const rows = readings.map((r, i) => ({
		sensor_id: ids[i],
		seq: r.seq,
		value: r.reading,
		label: r.label
	}));
	const payload = JSON.stringify(rows);
	// One statement: duplicates inside the batch, today's and yesterday's are all skipped.
	const result = await db.execute(sql`
		insert into readings (venue_id, controller_id, sensor_id, seq, value, label, at, day)
		select ${key.venueId}::uuid, ${key.controllerId}::uuid, x.sensor_id, x.seq, x.value, x.label,
			${now.toISOString()}::timestamptz, ${day}::date
		from (
			select distinct on (sensor_id, seq) sensor_id, seq, value, label
			from jsonb_to_recordset(${payload}::jsonb)
				as x(sensor_id uuid, seq bigint, value double precision, label text)
			order by sensor_id, seq
		) x
		where not exists (
			select 1 from readings r
			where r.sensor_id = x.sensor_id and r.seq = x.seq
				and r.day >= ${day}::date - 1 and r.day < ${day}::date
		)
		on conflict (sensor_id, seq, day) do nothing
		returning 1`);
	const stored = (result as unknown as unknown[]).length;
	return { ok: true, stored, duplicates: readings.length - stored };
}
