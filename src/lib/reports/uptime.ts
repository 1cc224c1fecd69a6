// Season report maths: show minutes, downtime, uptime, mean time between failures and mean time to
// repair, per prop and for the venue. Pure: shared by the server and the browser.
//
// The words follow the usual reliability-engineering terms of IEC 60050-192 (dependability), which
// replaced IEC 60050-191, where "mean time to restoration" is term 191-13-08 (as IEC 61703, the
// standard of mathematical expressions for those terms, cites it): availability as the share of
// the required time an item is able to perform, "mean operating time between failures" (written
// MTBF here) and "mean time to restoration" (written MTTR) (// memory: the 192 term names are
// recalled, not copied from the standard). Here restoration is counted from the report, so the
// time before anyone noticed is not in it. How Gloaming measures each one is its own
// choice, written on the report page in plain words:
//
// - Show minutes: the minutes between doors open and doors close of every scheduled night that
//   has begun (a night still running counts up to now). Dark and cancelled nights count nothing.
// - A prop is down from a fault report of severity "stops the scene" to the passing re-test that
//   verified its repair (to now while there is none), and for the whole of a night it is stood
//   down for. Only down minutes inside doors open..doors close count; overlaps count once.
// - Uptime of a prop = (show minutes − down minutes) / show minutes. The venue's uptime is the same
//   share over all its props together: working prop-minutes / (props × show minutes).
// - Failures: faults of severity "stops the scene" reported from a day before the first night's
//   doors open to a day after the last counted night's doors close (so pre-show and close-of-night
//   reports count). A stand-down is not a failure.
// - MTBF = working show minutes / failures (none when there were no failures).
// - MTTR = the mean, over those failures with a verified repair, of the time from the report to the
//   verified repair, in clock minutes (not only show minutes).

export interface ReportNight {
	id: string;
	doorsOpen: Date;
	doorsClose: Date;
}

export interface ReportFault {
	propId: string;
	reportedAt: Date;
	/** The passing re-test after the latest repair, or null while the fault is not verified. */
	verifiedAt: Date | null;
}

export interface ReportStandDown {
	propId: string;
	showId: string;
}

export interface PropUptime {
	propId: string;
	showMinutes: number;
	downMinutes: number;
	workingMinutes: number;
	/** 0..1, or null when there were no show minutes. */
	uptime: number | null;
	failures: number;
	repaired: number;
	/** Minutes, or null when there is nothing to divide by. */
	mtbf: number | null;
	mttr: number | null;
}

export interface UptimeReport {
	showMinutes: number;
	props: PropUptime[];
	venue: Omit<PropUptime, 'propId'>;
}

type Span = [number, number];
const MINUTE = 60_000;
const DAY = 86_400_000;

/** The spans merged so that none overlap, in order. */
export function mergeSpans(spans: Span[]): Span[] {
	const sorted = spans.filter(([a, b]) => b > a).sort((x, y) => x[0] - y[0]);
	const out: Span[] = [];
	for (const [a, b] of sorted) {
		const last = out[out.length - 1];
		if (last && a <= last[1]) last[1] = Math.max(last[1], b);
		else out.push([a, b]);
	}
	return out;
}

/** Milliseconds the (merged) spans share with the (merged) windows. */
function overlapMs(spans: Span[], windows: Span[]): number {
	let total = 0;
	for (const [a, b] of spans)
		for (const [c, d] of windows) total += Math.max(0, Math.min(b, d) - Math.max(a, c));
	return total;
}

/** The nights that count, each cut at `now`: scheduled and begun. */
export function countedWindows(nights: ReportNight[], now: Date): Span[] {
	const t = now.getTime();
	return mergeSpans(
		nights
			.filter((n) => n.doorsOpen.getTime() < t)
			.map((n) => [n.doorsOpen.getTime(), Math.min(n.doorsClose.getTime(), t)] as Span)
	);
}

const ratio = (a: number, b: number) => (b > 0 ? a / b : null);

/**
 * Uptime, MTBF and MTTR of each prop and of the venue over the given scheduled nights (dark and
 * cancelled nights left out by the caller). Faults are the "stops the scene" ones only.
 */
export function seasonUptime(input: {
	nights: ReportNight[];
	propIds: string[];
	faults: ReportFault[];
	standDowns: ReportStandDown[];
	now: Date;
}): UptimeReport {
	const { nights, propIds, faults, standDowns, now } = input;
	const windows = countedWindows(nights, now);
	const showMs = windows.reduce((s, [a, b]) => s + (b - a), 0);
	const showMinutes = showMs / MINUTE;
	const byId = new Map(nights.map((n) => [n.id, n]));
	const first = nights.length
		? Math.min(...nights.map((n) => n.doorsOpen.getTime()))
		: Number.POSITIVE_INFINITY;
	const last = windows.length ? windows[windows.length - 1][1] : Number.NEGATIVE_INFINITY;
	const props = propIds.map((propId): PropUptime => {
		const own = faults.filter((f) => f.propId === propId);
		const spans: Span[] = own.map((f) => [f.reportedAt.getTime(), (f.verifiedAt ?? now).getTime()]);
		for (const s of standDowns) {
			const night = s.propId === propId ? byId.get(s.showId) : undefined;
			if (night) spans.push([night.doorsOpen.getTime(), night.doorsClose.getTime()]);
		}
		const downMinutes = overlapMs(mergeSpans(spans), windows) / MINUTE;
		const workingMinutes = showMinutes - downMinutes;
		const failed = own.filter((f) => {
			const t = f.reportedAt.getTime();
			return t >= first - DAY && t <= last + DAY;
		});
		const repairs = failed.filter((f) => f.verifiedAt);
		const repairMinutes = repairs.reduce(
			(s, f) => s + (f.verifiedAt!.getTime() - f.reportedAt.getTime()) / MINUTE,
			0
		);
		return {
			propId,
			showMinutes,
			downMinutes,
			workingMinutes,
			uptime: ratio(workingMinutes, showMinutes),
			failures: failed.length,
			repaired: repairs.length,
			mtbf: ratio(workingMinutes, failed.length),
			mttr: ratio(repairMinutes, repairs.length)
		};
	});
	const sum = (pick: (p: PropUptime) => number) => props.reduce((s, p) => s + pick(p), 0);
	const propMinutes = showMinutes * props.length;
	const working = sum((p) => p.workingMinutes);
	const failures = sum((p) => p.failures);
	const repaired = sum((p) => p.repaired);
	const repairMinutes = sum((p) => (p.mttr ?? 0) * p.repaired);
	return {
		showMinutes,
		props,
		venue: {
			showMinutes: propMinutes,
			downMinutes: sum((p) => p.downMinutes),
			workingMinutes: working,
			uptime: ratio(working, propMinutes),
			failures,
			repaired,
			mtbf: ratio(working, failures),
			mttr: ratio(repairMinutes, repaired)
		}
	};
}

/** The props with the most down minutes, most first, leaving out those never down. */
export function mostDowntime<T extends PropUptime>(props: T[], n = 5): T[] {
	return props
		.filter((p) => p.downMinutes > 0)
		.sort((a, b) => b.downMinutes - a.downMinutes)
		.slice(0, n);
}
