import { sql } from 'drizzle-orm';
import type { Db } from '$lib/server/db/client';
import { forgetPartitions } from './ingest';

// The readings job: rolls raw readings up into per-minute figures (count, mean, sample sigma, min,
// max), makes the day partitions ahead, and drops the partitions older than the retention. Run it
// every few minutes; it is safe to run twice at once (a transaction-scoped advisory lock) and after
// a gap (it picks up from where it got to).

/** Readings arriving this late (board clocks are not involved; this is time in flight) still count. */
const LATE_MINUTES = 10;
const AHEAD_DAYS = 7;
const LOCK = 0x6c6f6f6d; // any constant shared by every app server

export interface RollupResult {
	minutes: number;
	partitionsMade: number;
	partitionsDropped: string[];
}

/** Upserts the minutes of readings with at in [from, to). */
async function rollMinutes(db: Db, from: string, to: string) {
	const rows = await db.execute(sql`
		insert into reading_minutes (venue_id, sensor_id, minute, count, mean, sigma, min, max, last_seq)
		select r.venue_id, r.sensor_id, date_trunc('minute', r.at), count(*)::int, avg(r.value),
			coalesce(stddev_samp(r.value), 0), min(r.value), max(r.value), max(r.seq)
		from readings r
		join sensors s on s.id = r.sensor_id
		where r.at >= ${from}::timestamptz and r.at < ${to}::timestamptz
			and r.day >= (${from}::timestamptz at time zone 'UTC')::date
			and r.day <= (${to}::timestamptz at time zone 'UTC')::date
		group by r.venue_id, r.sensor_id, date_trunc('minute', r.at)
		on conflict (sensor_id, minute) do update set
			count = excluded.count, mean = excluded.mean, sigma = excluded.sigma,
			min = excluded.min, max = excluded.max, last_seq = excluded.last_seq
		returning 1`);
	return (rows as unknown as unknown[]).length;
}

export async function runReadingsJob(
	db: Db,
	{ retentionDays, now = new Date() }: { retentionDays: number; now?: Date }
): Promise<RollupResult> {
	if (!Number.isInteger(retentionDays) || retentionDays < 1)
		throw new Error('The readings retention must be a whole number of days, at least 1.');
	const result = await db.transaction(async (tx) => {
		await tx.execute(sql`select pg_advisory_xact_lock(${LOCK})`);
		const nowIso = now.toISOString();
		const today = nowIso.slice(0, 10);
		const [made] = (await tx.execute(
			sql`select readings_add_partitions(${today}::date, ${AHEAD_DAYS}) as n`
		)) as unknown as { n: number }[];

		// Complete minutes since the last run, and the last few again for late arrivals.
		const [state] = (await tx.execute(
			sql`select through from reading_rollup_state where id = 1 for update`
		)) as unknown as { through: string | Date }[];
		const upTo = new Date(Math.floor(now.getTime() / 60_000) * 60_000);
		const since = new Date(
			Math.min(new Date(state?.through ?? upTo).getTime(), upTo.getTime()) - LATE_MINUTES * 60_000
		);
		let minutes = await rollMinutes(tx as unknown as Db, since.toISOString(), upTo.toISOString());
		await tx.execute(sql`
			insert into reading_rollup_state (id, through) values (1, ${upTo.toISOString()}::timestamptz)
			on conflict (id) do update set through = excluded.through`);

		// Partitions past the retention: rolled up whole once more, then dropped.
		const cutoff = new Date(Date.parse(today) - retentionDays * 86_400_000)
			.toISOString()
			.slice(0, 10);
		const parts = (await tx.execute(sql`
			select c.relname as name
			from pg_inherits i join pg_class c on c.oid = i.inhrelid
			where i.inhparent = 'readings'::regclass and c.relname ~ '^readings_[0-9]{8}$'
			order by c.relname`)) as unknown as { name: string }[];
		const dropped: string[] = [];
		for (const { name } of parts) {
			const d = name.slice(9);
			const day = `${d.slice(0, 4)}-${d.slice(4, 6)}-${d.slice(6, 8)}`;
			if (day >= cutoff) continue;
			const next = new Date(Date.parse(day) + 86_400_000).toISOString();
			minutes += await rollMinutes(tx as unknown as Db, `${day}T00:00:00.000Z`, next);
			await tx.execute(sql`drop table ${sql.identifier(name)}`);
			dropped.push(name);
		}
		return { minutes, partitionsMade: Number(made?.n ?? 0), partitionsDropped: dropped };
	});
	if (result.partitionsDropped.length) forgetPartitions();
	return result;
}
