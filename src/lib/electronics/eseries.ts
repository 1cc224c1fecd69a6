import { COMMON_PRACTICE, InputChecker, failed, fmt, ok, type Result } from './result';

/** IEC 60063 preferred-number series. */
export type ESeries = 'E6' | 'E12' | 'E24' | 'E48' | 'E96';

export const E_SERIES: readonly ESeries[] = ['E6', 'E12', 'E24', 'E48', 'E96'];

/** Resistor tolerance each series is meant for, percent. */
export const E_SERIES_TOLERANCE_PERCENT: Readonly<Record<ESeries, number>> = {
	E6: 20,
	E12: 10,
	E24: 5,
	E48: 2,
	E96: 1
};

const E6 = [10, 15, 22, 33, 47, 68];
const E12 = [10, 12, 15, 18, 22, 27, 33, 39, 47, 56, 68, 82];
// Hard-coded: E24 departs from round(10^(i/24)) at 2.7 3.0 3.3 3.6 3.9 4.3 4.7 8.2.
const E24 = [
	10, 11, 12, 13, 15, 16, 18, 20, 22, 24, 27, 30, 33, 36, 39, 43, 47, 51, 56, 62, 68, 75, 82, 91
];
const E96 = Array.from({ length: 96 }, (_, i) => Math.round(100 * 10 ** (i / 96)));
const E48 = E96.filter((_, i) => i % 2 === 0);

// Mantissas are whole numbers with two (E6..E24) or three (E48, E96) significant digits.
const TABLES: Record<ESeries, { mantissas: number[]; digits: number }> = {
	E6: { mantissas: E6, digits: 2 },
	E12: { mantissas: E12, digits: 2 },
	E24: { mantissas: E24, digits: 2 },
	E48: { mantissas: E48, digits: 3 },
	E96: { mantissas: E96, digits: 3 }
};

// Accepts a value that is a series member up to floating-point noise, e.g. 3 / 0.02.
const RELATIVE_SLACK = 1e-9;

// Dividing by an exact power of ten gives the nearest double to the decimal value (4.7, not 4.700…1).
function scale(mantissa: number, exponent: number): number {
	return exponent >= 0 ? mantissa * 10 ** exponent : mantissa / 10 ** -exponent;
}

/** The series values in one decade, from 1 up to (not including) 10. */
export function seriesValues(series: ESeries): number[] {
	const { mantissas, digits } = TABLES[series];
	return mantissas.map((m) => scale(m, 1 - digits));
}

function candidates(ohms: number, series: ESeries): number[] {
	const { mantissas, digits } = TABLES[series];
	const decade = Math.floor(Math.log10(ohms));
	const values: number[] = [];
	for (let d = decade - 1; d <= decade + 1; d++) {
		for (const m of mantissas) values.push(scale(m, d - (digits - 1)));
	}
	return values;
}

function checkOhms(ohms: number, series: ESeries): InputChecker {
	const check = new InputChecker();
	check.positive('ohms', ohms);
	if (!(series in TABLES)) check.add('series', `series must be one of ${E_SERIES.join(', ')}`);
	return check;
}

/** The smallest series value at or above `ohms`, moving into the next decade when needed. */
export function nextAtOrAbove(ohms: number, series: ESeries): Result<number> {
	const check = checkOhms(ohms, series);
	if (!check.clean) return failed(check.issues);
	const found = candidates(ohms, series).find((v) => v >= ohms * (1 - RELATIVE_SLACK));
	return found === undefined
		? failed([{ field: 'ohms', message: 'ohms is out of range' }])
		: ok(found);
}

/** The largest series value at or below `ohms`. */
export function nextAtOrBelow(ohms: number, series: ESeries): Result<number> {
	const check = checkOhms(ohms, series);
	if (!check.clean) return failed(check.issues);
	const found = candidates(ohms, series)
		.reverse()
		.find((v) => v <= ohms * (1 + RELATIVE_SLACK));
	return found === undefined
		? failed([{ field: 'ohms', message: 'ohms is out of range' }])
		: ok(found);
}

/**
 * The series value nearest to `ohms` by ratio, since the series are spaced geometrically.
 * A tie goes to the higher value, which errs toward less current.
 */
export function nearest(ohms: number, series: ESeries): Result<number> {
	const check = checkOhms(ohms, series);
	if (!check.clean) return failed(check.issues);
	let best = NaN;
	let bestDistance = Infinity;
	for (const v of candidates(ohms, series)) {
		const distance = Math.abs(Math.log(v / ohms));
		if (distance <= bestDistance + RELATIVE_SLACK) {
			best = v;
			bestDistance = Math.min(distance, bestDistance);
		}
	}
	return Number.isFinite(best)
		? ok(best)
		: failed([{ field: 'ohms', message: 'ohms is out of range' }]);
}

/** The largest gap between neighbouring values, as a percentage of the lower one. */
export function widestStepPercent(series: ESeries): number {
	const values = [...seriesValues(series), 10];
	let widest = 0;
	for (let i = 1; i < values.length; i++) {
		widest = Math.max(widest, (values[i] / values[i - 1] - 1) * 100);
	}
	return widest;
}

export type SeriesChoice = { series: ESeries; reason: string };

function shortfallPercent(stepPercent: number): number {
	return (1 - 1 / (1 + stepPercent / 100)) * 100;
}

/**
 * Picks a series. Without a limit, E24. With `maxStepPercent`, the coarsest series whose widest
 * step is within it, since rounding up can land at most one step above the exact value.
 */
export function chooseSeries(maxStepPercent?: number): Result<SeriesChoice> {
	if (maxStepPercent === undefined) {
		const step = widestStepPercent('E24');
		return ok({
			series: 'E24',
			reason:
				`E24 (±5 %) is the series most widely stocked (${COMMON_PRACTICE}). Its widest step is ` +
				`${fmt(step)} %, so rounding up leaves the current at most ` +
				`${fmt(shortfallPercent(step))} % under target.`
		});
	}
	const check = new InputChecker();
	check.positive('maxStepPercent', maxStepPercent);
	if (!check.clean) return failed(check.issues);
	for (const series of E_SERIES) {
		const step = widestStepPercent(series);
		if (step <= maxStepPercent) {
			return ok({
				series,
				reason:
					`${series} (±${E_SERIES_TOLERANCE_PERCENT[series]} %) is the coarsest series whose widest ` +
					`step (${fmt(step)} %) is within ${fmt(maxStepPercent)} %.`
			});
		}
	}
	return ok({
		series: 'E96',
		reason:
			`No series here steps finer than ${fmt(widestStepPercent('E96'))} %; E96 is the closest. ` +
			'For a tighter value combine two resistors or trim.'
	});
}
