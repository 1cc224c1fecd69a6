import { sql } from 'drizzle-orm';
import type { Db } from '$lib/server/db/client';

// What the boards have said lately: a sensor's last few minutes, second by second, for its live
// chart, and which boards with a key have gone quiet, for Tonight. Every lookup goes through the
// (sensor_id, at) index and the day partitions of today and yesterday (UTC), so it stays cheap
// however many readings a night brings.

/** The live chart's window. */
export const LIVE_WINDOW_S = 300;
/** A board with a key not heard from in this long is listed on Tonight. */
export const UNHEARD_MINUTES = 10;

const utcDay = (at: Date) => at.toISOString().slice(0, 10);
const rows = <T>(r: unknown) => r as T[];

/** When a controller's board last sent a reading that was stored, in the last two days. */
export async function lastHeard(db: Db, venueId: string, controllerId: string, now = new Date()) {
	const [r] = rows<{ at: string | Date | null }>(
		await db.execute(sql`
			select max(x.at) as at
			from sensors s
			join props p on p.id = s.prop_id and p.venue_id = s.venue_id
			cross join lateral (
				select r.at from readings r
				where r.sensor_id = s.id and r.day >= ${utcDay(now)}::date - 1
				order by r.at desc limit 1
			) x
			where s.venue_id = ${venueId} and p.controller_id = ${controllerId}`)
	);
	return r?.at ? new Date(r.at) : null;
}

export interface LivePoint {
	/** The second, as ms since 1970. */
	t: number;
	/** The mean of the readings in that second. */
	v: number;
}

/**
 * A sensor's readings from `after` (ms) up to the last complete second, one point a second, and
 * its latest single reading.
 */
export async function sensorLive(
	db: Db,
	venueId: string,
	sensorId: string,
	{ after, now = new Date() }: { after: number; now?: Date }
) {
	const from = new Date(Math.max(after, now.getTime() - LIVE_WINDOW_S * 1000));
	const upTo = new Date(Math.floor(now.getTime() / 1000) * 1000);
	const [points, last] = await Promise.all([
		db.execute(sql`
			select (extract(epoch from date_trunc('second', at)) * 1000)::float8 as t, avg(value) as v
			from readings
			where sensor_id = ${sensorId} and venue_id = ${venueId}
				and day >= ${utcDay(from)}::date and day <= ${utcDay(upTo)}::date
				and at >= ${from.toISOString()}::timestamptz and at < ${upTo.toISOString()}::timestamptz
			group by 1 order by 1`),
		db.execute(sql`
			select value, at from readings
			where sensor_id = ${sensorId} and venue_id = ${venueId} and day >= ${utcDay(now)}::date - 1
			order by at desc, seq desc limit 1`)
	]);
	const latest = rows<{ value: number; at: string | Date }>(last)[0];
	return {
		points: rows<{ t: number; v: number }>(points).map((p): LivePoint => ({
			t: Number(p.t),
			v: Number(p.v)
		})),
		latest: latest ? { reading: Number(latest.value), at: new Date(latest.at) } : null,
		/** Points up to here are complete: ask for the next ones after it. */
		through: upTo.getTime()
	};
}

export interface QuietBoard {
	controllerId: string;
	name: string;
	/** The last reading stored, or the last time its key was used; null when never heard. */
	lastAt: Date | null;
}

/** The venue's controllers with a key in force that have not sent a reading in `minutes`. */
export async function quietBoards(
	db: Db,
	venueId: string,
	{ minutes = UNHEARD_MINUTES, now = new Date() }: { minutes?: number; now?: Date } = {}
): Promise<QuietBoard[]> {
	const list = rows<{ id: string; name: string; last_at: string | Date | null }>(
		await db.execute(sql`
			select c.id, c.name, greatest(
				(select max(x.at)
					from props p
					join sensors s on s.prop_id = p.id and s.venue_id = p.venue_id
					cross join lateral (
						select r.at from readings r
						where r.sensor_id = s.id and r.day >= ${utcDay(now)}::date - 1
						order by r.at desc limit 1
					) x
					where p.venue_id = c.venue_id and p.controller_id = c.id),
				(select max(k.last_used_at) from board_keys k
					where k.venue_id = c.venue_id and k.controller_id = c.id)
			) as last_at
			from controllers c
			where c.venue_id = ${venueId}
				and exists (select 1 from board_keys k
					where k.venue_id = c.venue_id and k.controller_id = c.id and k.revoked_at is null)
			order by c.name`)
	);
	const cutoff = now.getTime() - minutes * 60_000;
	return list
		.map((r) => ({
			controllerId: r.id,
			name: r.name,
			lastAt: r.last_at ? new Date(r.last_at) : null
		}))
		.filter((b) => !b.lastAt || b.lastAt.getTime() < cutoff);
}
