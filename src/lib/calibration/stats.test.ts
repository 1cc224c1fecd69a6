import { describe, expect, it } from 'vitest';
import { CaptureStats, captureHistograms, histogram, LineFit, ReadingStats } from './stats';

function twoPass(values: number[]) {
	const mean = values.reduce((a, b) => a + b, 0) / values.length;
	const ss = values.reduce((a, v) => a + (v - mean) ** 2, 0);
	return { mean, sigma: Math.sqrt(ss / (values.length - 1)) };
}

describe('ReadingStats', () => {
	it('agrees with a two-pass computation of the same numbers', () => {
		// Welford 1962: the running update equals the two-pass mean and sample variance
		const values = Array.from(
			{ length: 5000 },
			(_, i) => 1e6 + Math.sin(i * 1.7) * 3 + (i % 7) * 0.25
		);
		const stats = new ReadingStats();
		for (const v of values) stats.add(v);
		const reference = twoPass(values);
		expect(Math.abs(stats.mean - reference.mean) / reference.mean).toBeLessThan(1e-13);
		expect(Math.abs(stats.sigma - reference.sigma) / reference.sigma).toBeLessThan(1e-9);
		expect(stats.count).toBe(5000);
		// definition of min and max
		expect(stats.min).toBe(Math.min(...values));
		expect(stats.max).toBe(Math.max(...values));
	});

	it('gives the textbook sample sigma of a small set', () => {
		// sample standard deviation of 2,4,4,4,5,5,7,9: mean 5, sum of squares 32, sqrt(32/7) = 2.1380899
		const stats = new ReadingStats();
		for (const v of [2, 4, 4, 4, 5, 5, 7, 9]) stats.add(v);
		expect(stats.mean).toBe(5);
		expect(stats.sigma).toBeCloseTo(Math.sqrt(32 / 7), 14);
	});

	it('keeps a bounded, evenly drawn sample', () => {
		// Vitter 1985, reservoir sampling: every reading is kept with probability size/count
		const stats = new ReadingStats({ sampleSize: 1000 });
		for (let i = 0; i < 100000; i++) stats.add(i);
		const { sample } = stats.summary();
		expect(sample).toHaveLength(1000);
		// uniform 0..99999 has mean 49999.5 and sd 28867.5; a 1000-sample mean is within 4 sd/sqrt(1000)
		const sampleMean = sample.reduce((a, b) => a + b, 0) / sample.length;
		expect(Math.abs(sampleMean - 49999.5)).toBeLessThan((4 * 28867.5) / Math.sqrt(1000));
	});

	it('reports an empty stream as NaN, not zero', () => {
		// a mean of no readings is undefined
		const summary = new ReadingStats().summary();
		expect([summary.count, summary.mean, summary.sigma]).toEqual([0, NaN, 0]);
	});
});

describe('LineFit', () => {
	it('recovers the slope of data generated from a known line', () => {
		// least squares: points on y = 1000 + 0.25 x with zero-mean symmetric noise give slope 0.25
		const fit = new LineFit();
		for (let i = 0; i < 1001; i++)
			fit.add(i, 1000 + 0.25 * i + (i % 2 === 0 ? 0.5 : -0.5) * (i < 500 ? 1 : -1));
		expect(fit.slope).toBeCloseTo(0.25, 5);
		expect(fit.intercept).toBeCloseTo(1000, 2);
	});

	it('is exact on points that lie on the line', () => {
		// least squares: collinear points are fitted exactly, even far from the origin
		const fit = new LineFit();
		for (let i = 0; i < 100; i++) fit.add(1e6 + i * 0.5, -3 + 12 * i * 0.5);
		expect(fit.slope).toBeCloseTo(12, 9);
	});

	it('has no slope without two different x values', () => {
		// least squares: the normal equations are singular when every x is equal
		const fit = new LineFit();
		fit.add(1, 1);
		fit.add(1, 2);
		expect(fit.slope).toBeNaN();
	});
});

describe('CaptureStats', () => {
	it('fits idle drift per minute over the time column', () => {
		// least squares on a known line: idle readings rise 0.01 per second = 0.6 per minute
		const stats = new CaptureStats();
		for (let i = 0; i < 3000; i++) {
			const time = i * 0.1;
			const present = i % 10 === 9;
			stats.add({
				time,
				reading: present ? 2000 : 1000 + 0.01 * time,
				label: present ? 'present' : 'idle'
			});
		}
		const summary = stats.summary();
		expect(summary.driftPerMinute).toBeCloseTo(0.6, 10);
		// rows over the time span: 2999 / 299.9 s = 10 Hz
		expect(summary.measuredRateHz).toBeCloseTo(10, 10);
		expect(summary.updateRateHz).toBeCloseTo(10, 10);
		expect([summary.idle.count, summary.present.count, summary.timed]).toEqual([2700, 300, true]);
	});

	it('uses row number and update rate when there is no time', () => {
		// least squares on a known line: 0.002 per row at 50 rows per second = 0.1/s = 6 per minute
		const stats = new CaptureStats({ updateRateHz: 50 });
		for (let i = 0; i < 1000; i++)
			stats.add({ reading: 500 + 0.002 * i, label: i % 4 === 0 ? 'present' : 'idle' });
		const summary = stats.summary();
		expect(summary.driftPerMinute).toBeCloseTo(6, 8);
		expect([summary.timed, summary.measuredRateHz, summary.updateRateHz]).toEqual([
			false,
			null,
			50
		]);
	});

	it('leaves drift unknown without time or rate', () => {
		// a slope per minute needs a time axis
		const stats = new CaptureStats();
		for (let i = 0; i < 10; i++) stats.add({ reading: i, label: 'idle' });
		expect(stats.summary().driftPerMinute).toBeNull();
	});
});

describe('histogram', () => {
	it('bins a sample and scales it to the readings it stands for', () => {
		// fixed-width binning: 0..9 into 5 bins of width 2 gives 2 each; scaled x10 for total 100
		const h = histogram([0, 1, 2, 3, 4, 5, 6, 7, 8, 9], { min: 0, max: 10, bins: 5, total: 100 });
		expect(h.edges).toEqual([0, 2, 4, 6, 8, 10]);
		expect(h.counts).toEqual([20, 20, 20, 20, 20]);
	});

	it('shares one range between the labels', () => {
		// fixed-width binning over the union of both ranges keeps bars comparable
		const stats = new CaptureStats();
		for (let i = 0; i < 100; i++) stats.add({ reading: 100 + (i % 10), label: 'idle' });
		for (let i = 0; i < 50; i++) stats.add({ reading: 150 + (i % 10), label: 'present' });
		const h = captureHistograms(stats.summary(), 10)!;
		expect(h.idle.edges).toEqual(h.present.edges);
		expect(h.idle.edges[0]).toBe(100);
		expect(h.idle.edges[10]).toBe(159);
		expect(h.idle.counts.reduce((a, b) => a + b, 0)).toBe(100);
		expect(h.present.counts.reduce((a, b) => a + b, 0)).toBe(50);
	});
});

describe('LineFit standard error', () => {
	// Anscombe (1973), "Graphs in Statistical Analysis", The American Statistician 27(1), data set I
	// (the same numbers ship as R's datasets::anscombe): slope 0.500, intercept 3.00, standard error
	// of the slope 0.118, t = 4.24, residual sum of squares 13.76.
	const x = [10, 8, 13, 9, 11, 14, 6, 4, 12, 7, 5];
	const y = [8.04, 6.95, 7.58, 8.81, 8.33, 9.96, 7.24, 4.26, 10.84, 4.82, 5.68];

	it("reproduces Anscombe's published fit of data set I", () => {
		const fit = new LineFit();
		x.forEach((xi, i) => fit.add(xi, y[i]));
		expect(fit.slope).toBeCloseTo(0.5, 3);
		expect(fit.intercept).toBeCloseTo(3.0, 2);
		expect(fit.slopeStandardError).toBeCloseTo(0.118, 3);
		expect(fit.slope / fit.slopeStandardError).toBeCloseTo(4.24, 2);
		expect(fit.residualDf).toBe(9);
	});

	it('gives the same figures far from the origin', () => {
		// shifting x and y leaves slope and standard error unchanged (least squares is shift invariant)
		const fit = new LineFit();
		x.forEach((xi, i) => fit.add(1e7 + xi, 5e5 + y[i]));
		expect(fit.slope).toBeCloseTo(0.5001, 4);
		expect(fit.slopeStandardError).toBeCloseTo(0.1179, 4);
	});

	it('has no standard error with fewer than three points', () => {
		const fit = new LineFit();
		fit.add(0, 0);
		fit.add(1, 1);
		expect(fit.slopeStandardError).toBeNaN();
	});
});

describe('CaptureStats update rate and drift error', () => {
	it('uses the measured rate of a timed capture, not the estimate it was given', () => {
		// rows over the time span: 999 rows after the first over 99.9 s = 10 per second
		const stats = new CaptureStats({ updateRateHz: 50 });
		for (let i = 0; i < 1000; i++) stats.add({ time: i * 0.1, reading: 700, label: 'idle' });
		const summary = stats.summary();
		expect(summary.updateRateHz).toBeCloseTo(10, 10);
		// a flat baseline: slope 0 with no scatter, so a standard error of 0
		expect(summary.driftPerMinute).toBeCloseTo(0, 10);
		expect(summary.driftDegreesOfFreedom).toBe(998);
	});

	it('scales the slope and its standard error to per minute alike', () => {
		// Anscombe data set I as idle readings one second apart: slope 0.5001 per second, SE 0.1179
		const x = [10, 8, 13, 9, 11, 14, 6, 4, 12, 7, 5];
		const y = [8.04, 6.95, 7.58, 8.81, 8.33, 9.96, 7.24, 4.26, 10.84, 4.82, 5.68];
		const stats = new CaptureStats();
		x.forEach((t, i) => stats.add({ time: t, reading: y[i], label: 'idle' }));
		const summary = stats.summary();
		expect(summary.driftPerMinute! / 60).toBeCloseTo(0.5001, 4);
		expect(summary.driftStandardErrorPerMinute! / 60).toBeCloseTo(0.1179, 4);
		expect(summary.driftDegreesOfFreedom).toBe(9);
	});
});
