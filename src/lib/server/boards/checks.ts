import { and, eq, isNull, isNotNull } from 'drizzle-orm';
import { sql } from 'drizzle-orm';
import type { Db } from '$lib/server/db/client';
import { checks } from '$lib/server/db/schema';

// What the boards say for a night's sensor tests: the idle reading already there (the mean of the
// last few seconds), and, after the crew member presses the button and puts a hand in, the peak of
// the readings in the window that followed, on the side present readings lie. Times are the
// server's (a reading's `at` is when the server stored it), so a phone's clock does not enter.

/** The idle reading is the mean of this many seconds of readings. */
export const IDLE_SECONDS = 3;
/** The window the present reading's peak is taken from. */
export const PRESENT_SECONDS = 5;
/** A board with no reading for a sensor in this long is not live for it. */
export const LIVE_SECONDS = 10;

const utcDay = (at: Date) => at.toISOString().slice(0, 10);

export interface BoardIdle {
	reading: number;
	/** The latest reading it was taken from (ms). */
	at: number;
	count: number;
}

export interface BoardPeak {
	reading: number;
	/** When that reading was stored (ms): sent back with the result, so the server can find it. */
	at: number;
	count: number;
}

/** The night's sensor tests with a band: check id → sensor and direction. */
async function readingChecks(db: Db, venueId: string, showId: string, checkId?: string) {
	const rows = await db
		.select({ id: checks.id, sensorId: checks.sensorId, expected: checks.expected })
		.from(checks)
		.where(
			and(
				eq(checks.venueId, venueId),
				eq(checks.showId, showId),
				isNull(checks.removedAt),
				isNotNull(checks.sensorId),
				checkId ? eq(checks.id, checkId) : undefined
			)
		);
	return rows.flatMap((r) =>
		r.expected.mode === 'reading' && r.sensorId
			? [{ checkId: r.id, sensorId: r.sensorId, direction: r.expected.band.direction }]
			: []
	);
}

/**
 * Per sensor test of the night whose board is live: the idle reading of the IDLE_SECONDS up to
 * `before` (the press, or now).
 */
export async function boardIdles(
	db: Db,
	venueId: string,
	showId: string,
	{ before = new Date(), checkId }: { before?: Date; checkId?: string } = {}
): Promise<Record<string, BoardIdle>> {
	const list = await readingChecks(db, venueId, showId, checkId);
	if (!list.length) return {};
	const ids = sql.join(
		[...new Set(list.map((c) => c.sensorId))].map((id) => sql`${id}::uuid`),
		sql`, `
	);
	const from = new Date(before.getTime() - LIVE_SECONDS * 1000);
	const rows = (await db.execute(sql`
		with recent as (
			select sensor_id, value, at from readings
			where venue_id = ${venueId} and sensor_id in (${ids})
				and day >= ${utcDay(from)}::date and day <= ${utcDay(before)}::date
				and at >= ${from.toISOString()}::timestamptz and at <= ${before.toISOString()}::timestamptz
		), last as (select sensor_id, max(at) as last_at from recent group by sensor_id)
		select r.sensor_id, avg(r.value) as reading, count(*)::int as n,
			(extract(epoch from l.last_at) * 1000)::float8 as at
		from recent r join last l using (sensor_id)
		where r.at > l.last_at - make_interval(secs => ${IDLE_SECONDS})
		group by r.sensor_id, l.last_at`)) as unknown as {
		sensor_id: string;
		reading: number;
		n: number;
		at: number;
	}[];
	const bySensor = new Map(rows.map((r) => [r.sensor_id, r]));
	const out: Record<string, BoardIdle> = {};
	for (const c of list) {
		const r = bySensor.get(c.sensorId);
		if (r) out[c.checkId] = { reading: Number(r.reading), at: Number(r.at), count: Number(r.n) };
	}
	return out;
}

/**
 * The peak reading of one sensor test's board in [from, to]: the highest for a sensor whose
 * present readings are higher, the lowest for one whose are lower. Null when none arrived, or the
 * check is not a sensor test with a band.
 */
export async function boardPeak(
	db: Db,
	venueId: string,
	showId: string,
	checkId: string,
	{ from, to }: { from: Date; to: Date }
): Promise<BoardPeak | null> {
	const [c] = await readingChecks(db, venueId, showId, checkId);
	if (!c) return null;
	const order = c.direction === 'down' ? sql`value asc` : sql`value desc`;
	const [row] = (await db.execute(sql`
		select value, (extract(epoch from at) * 1000)::float8 as at, count(*) over ()::int as n
		from readings
		where venue_id = ${venueId} and sensor_id = ${c.sensorId}
			and day >= ${utcDay(from)}::date and day <= ${utcDay(to)}::date
			and at >= ${from.toISOString()}::timestamptz and at <= ${to.toISOString()}::timestamptz
		order by ${order}, at limit 1`)) as unknown as { value: number; at: number; n: number }[];
	return row ? { reading: Number(row.value), at: Number(row.at), count: Number(row.n) } : null;
}

/** The board sent this very reading for this sensor at this time (ms): a result may say so. */
export async function boardSent(
	db: Db,
	venueId: string,
	sensorId: string,
	reading: number,
	at: Date
): Promise<boolean> {
	const rows = (await db.execute(sql`
		select 1 from readings
		where venue_id = ${venueId} and sensor_id = ${sensorId} and day = ${utcDay(at)}::date
			and at >= ${at.toISOString()}::timestamptz
			and at < ${new Date(at.getTime() + 1).toISOString()}::timestamptz
			and value = ${reading}
		limit 1`)) as unknown as unknown[];
	return rows.length > 0;
}
