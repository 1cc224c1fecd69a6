import { describe, expect, it } from 'vitest';
import { erf, erfc, normalUpperTail } from './erfc';

function expectRelative(actual: number, expected: number, tolerance: number) {
	expect(Math.abs(actual - expected) / Math.abs(expected)).toBeLessThan(tolerance);
}

describe('normalUpperTail', () => {
	it('matches the published normal tail for z = 1..6', () => {
		// NIST/SEMATECH e-Handbook normal table and OEIS A239383–A239387:
		const table: [number, number][] = [
			[1, 0.158655254], // P(Z>1)=0.158655254
			[2, 0.0227501319], // P(Z>2)=0.0227501319
			[3, 0.00134989803], // P(Z>3)=0.00134989803
			[4, 3.16712418e-5], // P(Z>4)=3.16712418e-5
			[5, 2.86651572e-7], // P(Z>5)=2.86651572e-7
			[6, 9.86587645e-10] // P(Z>6)=9.86587645e-10
		];
		// the table gives 9 significant digits, so agreement to 1e-8 relative is the most it can show
		for (const [z, p] of table) expectRelative(normalUpperTail(z), p, 1e-8);
	});

	it('is one half at zero and symmetric', () => {
		// NIST/SEMATECH e-Handbook: the normal distribution is symmetric about 0, P(Z>0)=0.5
		expect(normalUpperTail(0)).toBe(0.5);
		// NIST/SEMATECH e-Handbook normal table: P(Z>-3) = 1 - 0.00134989803
		expect(normalUpperTail(-3)).toBeCloseTo(1 - 0.00134989803, 11);
		expect(normalUpperTail(Infinity)).toBe(0);
		expect(normalUpperTail(-Infinity)).toBe(1);
	});
});

describe('erfc', () => {
	it('matches tabulated error function values in every interval', () => {
		// Abramowitz & Stegun Table 7.1 (memory): erf(0.25)=0.2763263902 (first interval, |x| <= 0.46875)
		expect(erf(0.25)).toBeCloseTo(0.2763263902, 10);
		// Abramowitz & Stegun Table 7.1 (memory): erf(0.5)=0.5204998778, erf(1)=0.8427007929, erf(2)=0.9953222650
		expect(erf(0.5)).toBeCloseTo(0.5204998778, 10);
		expect(erf(1)).toBeCloseTo(0.8427007929, 10);
		expect(erf(2)).toBeCloseTo(0.995322265, 10);
		// NIST/SEMATECH e-Handbook: P(Z>6) = erfc(6/sqrt2)/2, so erfc(4.2426) = 1.97317529e-9 (third interval, x > 4)
		expectRelative(erfc(6 / Math.SQRT2), 2 * 9.86587645e-10, 1e-8);
	});

	it('keeps the reflection and limits', () => {
		// Abramowitz & Stegun 7.1.9 (memory): erfc(-x) = 2 - erfc(x); erfc(0) = 1
		expect(erfc(0)).toBe(1);
		expect(erfc(-1)).toBeCloseTo(2 - (1 - 0.8427007929), 10);
		expect(erfc(-0.25)).toBeCloseTo(1.2763263902, 10);
		// Abramowitz & Stegun 7.1: erfc(x) -> 0 as x -> infinity (underflows in double precision past 26.55)
		expect(erfc(30)).toBe(0);
		expect(erfc(-30)).toBe(2);
		expect(erfc(NaN)).toBeNaN();
	});
});
