import { describe, expect, it } from 'vitest';
import { judgeBaseline } from './baseline-trend';
import { LineFit } from './stats';

describe('the least-squares line behind the baseline trend', () => {
	it("fits Anscombe's data set I: slope 0.500, intercept 3.00, slope standard error 0.118", () => {
		// Anscombe (1973), "Graphs in Statistical Analysis", The American Statistician 27(1), set I
		const x = [10, 8, 13, 9, 11, 14, 6, 4, 12, 7, 5];
		const y = [8.04, 6.95, 7.58, 8.81, 8.33, 9.96, 7.24, 4.26, 10.84, 4.82, 5.68];
		const fit = new LineFit();
		x.forEach((xi, i) => fit.add(xi, y[i]));
		expect(fit.slope).toBeCloseTo(0.5001, 4);
		expect(fit.intercept).toBeCloseTo(3.0001, 3);
		expect(fit.slopeStandardError).toBeCloseTo(0.1179, 4);
		expect(fit.residualDf).toBe(9);
	});
});

describe('judgeBaseline', () => {
	const band = { low: 480, high: 520 };

	it('says tonight is outside when the last baseline has left the band', () => {
		expect(judgeBaseline([500, 501, 523], band)).toEqual({
			state: 'outside',
			tonight: 523,
			side: 'high'
		});
		expect(judgeBaseline([479.5], band)).toMatchObject({ state: 'outside', side: 'low' });
	});

	it('finds a steady climb towards the top edge, with the nights left', () => {
		// 500, 502, … 514: a straight line with a little scatter, slope 2 per night; fitted tonight
		// at about 514, so the edge at 520 is about 3 nights away
		const nights = [500, 502.3, 503.8, 506.2, 507.9, 510.1, 512.2, 513.8];
		const j = judgeBaseline(nights, band);
		expect(j.state).toBe('trending');
		if (j.state !== 'trending') return;
		expect(j.side).toBe('high');
		expect(j.slopePerNight).toBeCloseTo(2, 0);
		expect(j.nightsToEdge).toBeGreaterThan(2);
		expect(j.nightsToEdge).toBeLessThan(4);
	});

	it('finds a fall towards the bottom edge too', () => {
		expect(judgeBaseline([497, 494, 491.2, 488.1, 485.4], band)).toMatchObject({
			state: 'trending',
			side: 'low'
		});
	});

	it('leaves scatter without a significant slope alone', () => {
		// these wander by ±3 with no direction: the slope is well within its standard error
		const j = judgeBaseline([500, 503, 498, 502, 497, 501, 499, 502], band);
		expect(j.state).toBe('inside');
	});

	it('leaves a significant but slow climb alone when the edge is far beyond the horizon', () => {
		// 0.2 per night from 500: the edge is about 90 nights away
		const j = judgeBaseline([500, 500.2, 500.41, 500.6, 500.79, 501.0], band);
		expect(j.state).toBe('inside');
	});

	it('judges no trend on fewer than four nights, and nothing without nights', () => {
		expect(judgeBaseline([500, 505, 510], band)).toMatchObject({
			state: 'inside',
			slopePerNight: null
		});
		expect(judgeBaseline([], band)).toEqual({ state: 'unknown' });
	});
});
