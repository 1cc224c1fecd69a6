import { sql, type SQL } from 'drizzle-orm';
import type { Db } from '$lib/server/db/client';
import { judgeBaseline, type BaselineState } from '$lib/calibration/baseline-trend';
import type { SensorCalibration } from '$lib/server/db/schema';
import { figure } from '$lib/quantity';

// Each night's idle baseline of a sensor: the mean of its readings in the hour before doors open,
// from the per-minute rollups (so it costs one index range of at most 60 rows per sensor and night,
// and it outlives the raw readings). Minutes in which the reading crossed the sensor's enter
// threshold (a hand in during the checks, a guest early) are left out, so only idle minutes count.

/** The window before doors the baseline is taken from. */
export const BASELINE_WINDOW_MINUTES = 60;
export const BASELINE_WINDOW_WORDS = 'the hour before doors open';

export interface NightBaseline {
	showId: string;
	/** The venue's local date of the night. */
	date: string;
	sensorId: string;
	baseline: number;
	/** Readings behind it. */
	readings: number;
}

/**
 * The nightly baselines of these sensors (a list of ids, passed as one array parameter, or a
 * subquery of their ids), for the venue's shows on or before `upTo` (a local date)
 * and from `from`, oldest first (either may be left out). Nights with no idle minutes in the window have no row.
 */
export async function nightlyBaselines(
	db: Db,
	venueId: string,
	sensorIds: string[] | SQL,
	{ upTo, from }: { upTo?: string; from?: string }
): Promise<NightBaseline[]> {
	if (Array.isArray(sensorIds) && !sensorIds.length) return [];
	const which = Array.isArray(sensorIds)
		? sql`s.id = any(${`{${sensorIds.join(',')}}`}::uuid[])`
		: sql`s.id in (${sensorIds})`;
	const rows = (await db.execute(sql`
		select sh.id as show_id, sh.date::text as date, s.id as sensor_id,
			sum(m.count * m.mean) / sum(m.count) as baseline, sum(m.count)::int as readings
		from shows sh
		join sensors s on s.venue_id = sh.venue_id
		join reading_minutes m on m.sensor_id = s.id and m.venue_id = s.venue_id
			and m.minute >= sh.doors_open - make_interval(mins => ${BASELINE_WINDOW_MINUTES})
			and m.minute < sh.doors_open
		where sh.venue_id = ${venueId} and ${which}
			and sh.status = 'scheduled'
			${upTo ? sql`and sh.date <= ${upTo}::date` : sql``}
			${from ? sql`and sh.date >= ${from}::date` : sql``}
			and (s.calibration is null
				or case when s.calibration->>'direction' = 'down'
					then m.min > (s.calibration->>'enter')::float8
					else m.max < (s.calibration->>'enter')::float8 end)
		group by sh.id, sh.date, s.id
		order by sh.date, sh.doors_open`)) as unknown as {
		show_id: string;
		date: string;
		sensor_id: string;
		baseline: number;
		readings: number;
	}[];
	return rows.map((r) => ({
		showId: r.show_id,
		date: r.date,
		sensorId: r.sensor_id,
		baseline: Number(r.baseline),
		readings: Number(r.readings)
	}));
}

export type BaselineJudgement = BaselineState & {
	/** Tonight's show has a baseline of its own (not only earlier nights'). */
	tonightMeasured: boolean;
};

/** Judge tonight's baseline per sensor (nights up to and including `showId`'s). */
export function judgeNights(
	nights: NightBaseline[],
	sensorId: string,
	showId: string,
	calibration: SensorCalibration | null
): BaselineJudgement {
	if (!calibration) return { state: 'unknown', tonightMeasured: false };
	const mine = nights.filter((n) => n.sensorId === sensorId);
	const tonightMeasured = mine.some((n) => n.showId === showId);
	if (!tonightMeasured) return { state: 'unknown', tonightMeasured };
	const j = judgeBaseline(
		mine.map((n) => n.baseline),
		{ low: calibration.baselineLow, high: calibration.baselineHigh }
	);
	return { ...j, tonightMeasured };
}

/** The words for the checklist line and Tonight; null when there is nothing to say. */
export function baselineWords(
	j: BaselineJudgement,
	calibration: SensorCalibration | null
): string | null {
	if (!calibration) return null;
	// Readings to six significant figures: a band's edges often differ only in the fifth.
	const r = (v: number) => figure(v, 6);
	const band = `${r(calibration.baselineLow)} to ${r(calibration.baselineHigh)}`;
	if (j.state === 'outside')
		return `Tonight's idle baseline (${r(j.tonight)}, ${BASELINE_WINDOW_WORDS}) is ${
			j.side === 'high' ? 'above' : 'below'
		} the calibrated band ${band}: the sensor has drifted. Recalibrate it or look for what changed.`;
	if (j.state === 'trending') {
		const n = Math.max(1, Math.ceil(j.nightsToEdge));
		return `The idle baseline is ${j.side === 'high' ? 'rising' : 'falling'} by ${figure(
			Math.abs(j.slopePerNight),
			2
		)} a night (tonight ${r(j.tonight)}) and would leave the calibrated band ${band} in about ${
			n === 1 ? 'one night' : `${n} nights`
		}.`;
	}
	return null;
}

export interface BaselineAlert {
	sensorId: string;
	sensorName: string;
	propId: string;
	propName: string;
	state: 'outside' | 'trending';
	words: string;
}

/** How far back a night's trend looks: a season's length. */
const SEASON_DAYS = 120;

/**
 * The venue's calibrated sensors whose baseline on this show's night is outside its band or
 * trending towards it, by prop and sensor name.
 */
export async function baselineAlerts(
	db: Db,
	venueId: string,
	show: { id: string; date: string }
): Promise<BaselineAlert[]> {
	const from = new Date(Date.parse(show.date) - SEASON_DAYS * 86_400_000)
		.toISOString()
		.slice(0, 10);
	// Only sensors whose boards have sent anything this season: one index probe each. The list and
	// the nights are read together, the nights' sensors picked by the same condition.
	const recent = sql`s.venue_id = ${venueId} and s.calibration is not null
		and exists (select 1 from reading_minutes m
			where m.sensor_id = s.id and m.venue_id = s.venue_id and m.minute >= ${from}::date - 1)`;
	const [list, nights] = await Promise.all([
		db.execute(sql`
			select s.id, s.name, s.calibration, p.id as prop_id, p.name as prop_name
			from sensors s join props p on p.id = s.prop_id and p.venue_id = s.venue_id
			where ${recent}
			order by p.name, s.name`) as unknown as Promise<
			{
				id: string;
				name: string;
				calibration: SensorCalibration;
				prop_id: string;
				prop_name: string;
			}[]
		>,
		nightlyBaselines(db, venueId, sql`select s.id from sensors s where ${recent}`, {
			upTo: show.date,
			from
		})
	]);
	if (!list.length) return [];
	const out: BaselineAlert[] = [];
	for (const s of list) {
		const j = judgeNights(nights, s.id, show.id, s.calibration);
		const words = baselineWords(j, s.calibration);
		if (!words || (j.state !== 'outside' && j.state !== 'trending')) continue;
		out.push({
			sensorId: s.id,
			sensorName: s.name,
			propId: s.prop_id,
			propName: s.prop_name,
			state: j.state,
			words
		});
	}
	return out;
}
