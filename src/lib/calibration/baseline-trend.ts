import { LineFit } from './stats';
import { slopeIsSignificant } from './student-t';

// Is a sensor's idle baseline, night after night, leaving its calibrated band? Tonight's value
// outside the band says so at once; otherwise a least-squares line through the last nights (x = the
// night's place in the list, so dark nights do not stretch it) whose slope is significant against its
// standard error, and that would reach the band's edge within a few nights, says it is heading there.

/** Nights fitted: the latest this many with a baseline. */
export const TREND_NIGHTS = 10;
/** A significant trend that would reach the band's edge within this many nights is reported. */
export const TREND_HORIZON_NIGHTS = 5;
/** Fewer nights than this and no trend is judged. */
export const TREND_MIN_NIGHTS = 4;

export interface BaselineBand {
	low: number;
	high: number;
}

export type BaselineState =
	| { state: 'inside'; tonight: number; slopePerNight: number | null }
	| { state: 'outside'; tonight: number; side: 'low' | 'high' }
	| {
			state: 'trending';
			tonight: number;
			side: 'low' | 'high';
			slopePerNight: number;
			standardError: number;
			/** Nights from tonight until the fitted line reaches the band's edge. */
			nightsToEdge: number;
	  }
	| { state: 'unknown' };

/**
 * Judge the latest baseline (the last of `baselines`, oldest first) against the band, and the
 * trend of the last TREND_NIGHTS of them.
 */
export function judgeBaseline(
	baselines: readonly number[],
	band: BaselineBand,
	{
		nights = TREND_NIGHTS,
		horizon = TREND_HORIZON_NIGHTS
	}: { nights?: number; horizon?: number } = {}
): BaselineState {
	const finite = baselines.filter((b) => Number.isFinite(b));
	if (!finite.length || !(band.high >= band.low)) return { state: 'unknown' };
	const tonight = finite[finite.length - 1];
	if (tonight < band.low) return { state: 'outside', tonight, side: 'low' };
	if (tonight > band.high) return { state: 'outside', tonight, side: 'high' };

	const recent = finite.slice(-nights);
	if (recent.length < TREND_MIN_NIGHTS) return { state: 'inside', tonight, slopePerNight: null };
	const fit = new LineFit();
	recent.forEach((y, x) => fit.add(x, y));
	const slope = fit.slope;
	const se = fit.slopeStandardError;
	if (!slopeIsSignificant(slope, se, fit.residualDf))
		return { state: 'inside', tonight, slopePerNight: Number.isFinite(slope) ? slope : null };
	// Where the fitted line stands tonight, and how far it has to go to the edge it is heading for.
	const x = recent.length - 1;
	const fitted = fit.intercept + slope * x;
	const side = slope > 0 ? 'high' : 'low';
	const edge = side === 'high' ? band.high : band.low;
	const nightsToEdge = Math.max(0, (edge - fitted) / slope);
	if (nightsToEdge > horizon) return { state: 'inside', tonight, slopePerNight: slope };
	return {
		state: 'trending',
		tonight,
		side,
		slopePerNight: slope,
		standardError: se,
		nightsToEdge
	};
}
