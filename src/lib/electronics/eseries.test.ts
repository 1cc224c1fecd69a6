import { describe, expect, it } from 'vitest';
import {
	E_SERIES_TOLERANCE_PERCENT,
	chooseSeries,
	nearest,
	nextAtOrAbove,
	nextAtOrBelow,
	seriesValues,
	widestStepPercent
} from './eseries';
import type { Result } from './result';

function value<T>(result: Result<T>): T {
	if (!result.ok) expect.fail(JSON.stringify(result.issues));
	return result.value;
}

// IEC 60063 tables as published
const IEC_E6 = [1.0, 1.5, 2.2, 3.3, 4.7, 6.8];
const IEC_E12 = [1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2];
const IEC_E24 = [
	1.0, 1.1, 1.2, 1.3, 1.5, 1.6, 1.8, 2.0, 2.2, 2.4, 2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 5.1, 5.6,
	6.2, 6.8, 7.5, 8.2, 9.1
];
// IEC 60063: E96 is round(100*10^(i/96)); E48 is every second E96 value
const FORMULA_E96 = Array.from({ length: 96 }, (_, i) => Math.round(100 * 10 ** (i / 96)) / 100);
const FORMULA_E48 = FORMULA_E96.filter((_, i) => i % 2 === 0);

describe('series tables', () => {
	it('holds the IEC 60063 E6, E12 and E24 values', () => {
		// IEC 60063 E6 series
		expect(seriesValues('E6')).toEqual(IEC_E6);
		// IEC 60063 E12 series
		expect(seriesValues('E12')).toEqual(IEC_E12);
		// IEC 60063 E24 series
		expect(seriesValues('E24')).toEqual(IEC_E24);
	});

	it('keeps the eight E24 values that differ from the rounded geometric formula', () => {
		// reference-values: E24 departs from round(10^(i/24)) at 2.7 3.0 3.3 3.6 3.9 4.3 4.7 8.2
		const rounded = Array.from({ length: 24 }, (_, i) => Math.round(10 * 10 ** (i / 24)) / 10);
		const e24 = seriesValues('E24');
		const differing = e24.filter((v, i) => v !== rounded[i]);
		expect(differing).toEqual([2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 8.2]);
	});

	it('builds E96 and E48 from the published formula', () => {
		// IEC 60063 E96: round(100*10^(i/96)) for every i
		expect(seriesValues('E96')).toEqual(FORMULA_E96);
		// IEC 60063 E48: every second E96 value
		expect(seriesValues('E48')).toEqual(FORMULA_E48);
		// memory: familiar E96 members 1.00 4.99 9.09 9.31 9.76, and 9.20 is not one
		expect(seriesValues('E96')).toEqual(expect.arrayContaining([1.0, 4.99, 9.09, 9.31, 9.76]));
		expect(seriesValues('E96')).not.toContain(9.2);
		expect(seriesValues('E48')).toHaveLength(48);
	});

	it('gives each series its IEC tolerance', () => {
		// IEC 60063: E6 ±20 %, E12 ±10 %, E24 ±5 %, E48 ±2 %, E96 ±1 %
		expect(E_SERIES_TOLERANCE_PERCENT).toEqual({ E6: 20, E12: 10, E24: 5, E48: 2, E96: 1 });
	});
});

describe('nextAtOrAbove', () => {
	it('keeps a value that is already in the series', () => {
		// IEC 60063 E24 series contains 150 and 4.7
		expect(value(nextAtOrAbove(150, 'E24'))).toBe(150);
		expect(value(nextAtOrAbove(4.7, 'E24'))).toBe(4.7);
		// LED resistor practice: (5 - 2.0)/0.020 -> 150 ohm exactly, despite floating-point noise
		expect(value(nextAtOrAbove((5 - 2) / 0.02, 'E24'))).toBe(150);
	});

	it('moves up to the next series value', () => {
		// IEC 60063 E24 series: 150 then 160
		expect(value(nextAtOrAbove(151, 'E24'))).toBe(160);
		// IEC 60063 E12 series: 0.27 then 0.33
		expect(value(nextAtOrAbove(0.28, 'E12'))).toBe(0.33);
		// IEC 60063 E6 series: 4.7k then 6.8k
		expect(value(nextAtOrAbove(4701, 'E6'))).toBe(6800);
		// IEC 60063 E96 formula: 84.5 then 86.6
		expect(value(nextAtOrAbove(85, 'E96'))).toBe(86.6);
	});

	it('crosses into the next decade', () => {
		// IEC 60063 E24 series: 9.1k is the last value below 10k
		expect(value(nextAtOrAbove(9200, 'E24'))).toBe(10000);
		// IEC 60063 E96 formula: 976 is the last value below 1000
		expect(value(nextAtOrAbove(977, 'E96'))).toBe(1000);
		// IEC 60063 E12 series, megohm decade
		expect(value(nextAtOrAbove(8.3e6, 'E12'))).toBe(1e7);
	});

	it('rejects non-positive and non-finite values', () => {
		// preferred numbers are positive (IEC 60063)
		expect(nextAtOrAbove(0, 'E24').ok).toBe(false);
		expect(nextAtOrAbove(-10, 'E24').ok).toBe(false);
		expect(nextAtOrAbove(Number.NaN, 'E24').ok).toBe(false);
		expect(nextAtOrAbove(Infinity, 'E24').ok).toBe(false);
	});
});

describe('nextAtOrBelow', () => {
	it('moves down to the previous series value, across decades', () => {
		// IEC 60063 E24 series: 130 then 150
		expect(value(nextAtOrBelow(149, 'E24'))).toBe(130);
		// IEC 60063 E24 series: 9.1 below 10
		expect(value(nextAtOrBelow(9.99, 'E24'))).toBe(9.1);
		// IEC 60063 E12 series contains 1k
		expect(value(nextAtOrBelow(1000, 'E12'))).toBe(1000);
	});
});

describe('nearest', () => {
	it('picks the closest value by ratio', () => {
		// IEC 60063 E12 series: 140 is 7 % under 150 and 17 % over 120
		expect(value(nearest(140, 'E12'))).toBe(150);
		// IEC 60063 E24 series: 9.5 is 4.4 % over 9.1 and 5.3 % under 10
		expect(value(nearest(9.5, 'E24'))).toBe(9.1);
		// IEC 60063 E96 formula: 10.09k lies between 10.0k and 10.2k, nearer 10.0k by ratio
		expect(value(nearest(10090, 'E96'))).toBe(10000);
		// IEC 60063 E6 series: 3.3 and 4.7 around 3.9; 3.9/3.3 = 1.18, 4.7/3.9 = 1.21
		expect(value(nearest(3.9, 'E6'))).toBe(3.3);
	});

	it('rejects a zero value', () => {
		// preferred numbers are positive (IEC 60063)
		expect(nearest(0, 'E24').ok).toBe(false);
	});
});

describe('widestStepPercent and chooseSeries', () => {
	it('finds the widest step in each table', () => {
		// IEC 60063 E6 series: 1.0 -> 1.5 is a 50 % step
		expect(widestStepPercent('E6')).toBeCloseTo(50, 9);
		// IEC 60063 E12 series: 1.2 -> 1.5 is a 25 % step
		expect(widestStepPercent('E12')).toBeCloseTo(25, 9);
		// IEC 60063 E24 series: 1.3 -> 1.5 is the widest step
		expect(widestStepPercent('E24')).toBeCloseTo((1.5 / 1.3 - 1) * 100, 9);
		// IEC 60063 E96 formula: 1.33 -> 1.37 is the widest step
		expect(widestStepPercent('E96')).toBeCloseTo((1.37 / 1.33 - 1) * 100, 9);
	});

	it('defaults to E24 and says why', () => {
		// common practice, no published source: E24 is the everyday stocked series
		const choice = value(chooseSeries());
		expect(choice.series).toBe('E24');
		// IEC 60063 E24: widest step 1.3 -> 1.5, so rounding up costs at most 1 - 1.3/1.5 of the current
		expect(choice.reason).toContain(String(Number(((1 - 1.3 / 1.5) * 100).toPrecision(4))));
	});

	it('picks the coarsest series whose widest step fits', () => {
		// IEC 60063 tables: E6 steps up to 50 %, E12 up to 25 %, E24 up to 15.4 %
		expect(value(chooseSeries(60)).series).toBe('E6');
		expect(value(chooseSeries(30)).series).toBe('E12');
		expect(value(chooseSeries(20)).series).toBe('E24');
		// IEC 60063 E48 (every second E96): widest step about 5.3 %
		expect(value(chooseSeries(6)).series).toBe('E48');
		// IEC 60063 E96 formula: widest step 1.33 -> 1.37, about 3 %
		expect(value(chooseSeries(3.1)).series).toBe('E96');
		expect(value(chooseSeries(1)).series).toBe('E96');
		expect(chooseSeries(0).ok).toBe(false);
	});
});
