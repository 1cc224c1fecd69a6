import { describe, expect, it } from 'vitest';
import jStat from 'jstat';
import { slopeIsSignificant, tCritical95 } from './student-t';

describe('tCritical95', () => {
	it("matches a reference library's Student t quantile at the 97.5th percentile, to 0.2 %", () => {
		// jStat's studentt.inv(0.975, df), a general-purpose reference implementation from npm
		for (const df of [1, 2, 3, 4, 5, 9, 15, 30, 120, 1000, 100000]) {
			const reference = jStat.studentt.inv(0.975, df);
			expect(Math.abs(tCritical95(df) - reference) / reference, `df ${df}`).toBeLessThan(2e-3);
		}
	});

	it('falls to the normal value 1.959964 for many degrees of freedom', () => {
		// standard normal 97.5th percentile (NIST/SEMATECH e-Handbook normal table: 1.960)
		expect(tCritical95(1e9)).toBeCloseTo(1.959964, 6);
	});
});

describe('slopeIsSignificant', () => {
	// Anscombe (1973), "Graphs in Statistical Analysis", data set I: slope 0.500, standard error
	// 0.118, t = 4.24 on 9 degrees of freedom, significant at the 5 % level (t(9) = 2.262).
	it("takes Anscombe's data set I as a significant slope", () => {
		expect(slopeIsSignificant(0.5001, 0.1179, 9)).toBe(true);
	});

	it('does not take a slope of 1.5 standard errors as significant', () => {
		// |t| = 1.5 is below 1.960 for any number of degrees of freedom
		expect(slopeIsSignificant(0.15, 0.1, 10_000)).toBe(false);
		expect(slopeIsSignificant(-0.15, 0.1, 10_000)).toBe(false);
	});

	it('needs a standard error and degrees of freedom', () => {
		expect(slopeIsSignificant(1, NaN, 100)).toBe(false);
		expect(slopeIsSignificant(1, 0.1, 0)).toBe(false);
		// a perfect line with no scatter is significant whenever its slope is not zero
		expect(slopeIsSignificant(1, 0, 100)).toBe(true);
		expect(slopeIsSignificant(0, 0, 100)).toBe(false);
	});
});
