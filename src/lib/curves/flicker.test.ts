import { describe, expect, it } from 'vitest';
import { checkFlicker, modulationPercent, pwmModulationPercent } from './flicker';

describe('modulationPercent', () => {
	it('follows the IEEE 1789 definition', () => {
		// IEEE 1789-2015: Mod% = 100 * (Lmax - Lmin) / (Lmax + Lmin); on/off PWM is 100 %
		expect(modulationPercent(1, 0)).toBe(100);
		expect(modulationPercent(3, 1)).toBe(50);
		expect(modulationPercent(2, 2)).toBe(0);
		expect(() => modulationPercent(1, 2)).toThrow(RangeError);
	});

	it('treats PWM at 0 or full duty as steady', () => {
		// IEEE 1789-2015 definition: light that does not change has Mod% = 0
		expect([pwmModulationPercent(0), pwmModulationPercent(0.4), pwmModulationPercent(1)]).toEqual([
			0, 100, 0
		]);
	});
});

describe('checkFlicker (IEEE 1789-2015 low-risk region, boundaries memory)', () => {
	it('uses 0.025 * f below 90 Hz', () => {
		// IEEE 1789-2015 (memory): below 90 Hz low risk when Mod% < 0.025 * f; 60 Hz -> 1.5 %
		const check = checkFlicker(60, 1);
		expect(check.limitPercent).toBeCloseTo(1.5, 12);
		expect(check.risk).toBe('low-risk');
		expect(checkFlicker(60, 2).risk).toBe('not-low-risk');
		// IEEE 1789-2015 (memory): 89 Hz -> 2.225 %
		expect(checkFlicker(89).limitPercent).toBeCloseTo(2.225, 12);
	});

	it('uses 0.08 * f from 90 to 1250 Hz', () => {
		// IEEE 1789-2015 (memory): 90..1250 Hz low risk when Mod% < 0.08 * f; 90 Hz -> 7.2 %, 100 Hz -> 8 %
		expect(checkFlicker(90).limitPercent).toBeCloseTo(7.2, 12);
		expect(checkFlicker(100, 5).risk).toBe('low-risk');
		expect(checkFlicker(100, 10).risk).toBe('not-low-risk');
	});

	it('rates common microcontroller PWM frequencies', () => {
		// timer datasheets: 16 MHz / (64 * 256) = 976.5625 Hz; IEEE 1789-2015 (memory): limit 78.125 %
		const fast = checkFlicker(16e6 / (64 * 256));
		expect(fast.limitPercent).toBeCloseTo(78.125, 10);
		expect(fast.risk).toBe('not-low-risk');
		// timer datasheets: phase-correct 16 MHz / (64 * 510) = 490.196 Hz -> limit 39.2 %
		expect(checkFlicker(16e6 / (64 * 510)).limitPercent).toBeCloseTo(39.2157, 4);
	});

	it('allows any modulation above 1250 Hz', () => {
		// IEEE 1789-2015 (memory): above 1250 Hz any modulation is low risk
		expect(checkFlicker(2000)).toEqual({
			frequencyHz: 2000,
			modulationPercent: 100,
			limitPercent: null,
			risk: 'low-risk'
		});
		// IEEE 1789-2015 (memory): at 1250 Hz the limit is 0.08 * 1250 = 100 %, which on/off PWM does not pass under
		expect(checkFlicker(1250).risk).toBe('not-low-risk');
	});

	it('refuses impossible inputs', () => {
		// IEEE 1789-2015: frequency is positive and Mod% lies in 0..100
		expect(() => checkFlicker(0)).toThrow(RangeError);
		expect(() => checkFlicker(100, 120)).toThrow(RangeError);
	});
});
