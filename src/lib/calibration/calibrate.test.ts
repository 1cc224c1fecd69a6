import { describe, expect, it } from 'vitest';
import { CalibrationInputError, calibrate, depthOf } from './calibrate';

function expectRelative(actual: number, expected: number, tolerance = 1e-8) {
	expect(Math.abs(actual - expected) / Math.abs(expected)).toBeLessThan(tolerance);
}

const idle = { count: 5000, mean: 500, sigma: 2 };

describe('calibrate', () => {
	it('places enter 5 idle sigmas out and exit halfway back', () => {
		const cal = calibrate({
			idle,
			present: { count: 1000, mean: 540, sigma: 5 },
			updateRateHz: 50
		});
		// capacitive RC counts rise with a hand: present above idle reads as 'up'
		expect(cal.direction).toBe('up');
		// threshold rule, common practice, no published source: enter = 500 + 5 * 2, exit halfway back
		expect(cal.enter).toBe(510);
		expect(cal.exit).toBe(505);
		// NIST/SEMATECH e-Handbook normal table: P(Z>5)=2.86651572e-7 per update
		expectRelative(cal.falseTriggerPerUpdate, 2.86651572e-7);
		// P(Z>5) * 50 updates/s * 3600 s = 0.0515972830 per hour
		expectRelative(cal.falseTriggersPerHour!, 2.86651572e-7 * 50 * 3600);
		// NIST/SEMATECH e-Handbook normal table: present mean 540 is (540-510)/5 = 6 sigmas past enter, P(Z>6)=9.86587645e-10
		expectRelative(cal.missProbability, 9.86587645e-10);
		// d' = 40 / sqrt((2^2 + 5^2) / 2) = 40 / sqrt(14.5) = 10.5045746
		expect(cal.separation).toBeCloseTo(40 / Math.sqrt(14.5), 12);
		// glossary: depth 0 at the far edge (exit threshold), 1 fully in (present mean)
		expect(cal.depth).toEqual({ far: 505, near: 540 });
		// baseline band, common practice, no published source: idle mean +- the exit offset
		expect(cal.baselineBand).toEqual({ low: 495, high: 505 });
		// d' 10.5, 0.05 false triggers per hour, misses 1e-9: inside every warning limit
		expect(cal.warnings).toEqual([]);
	});

	it('mirrors everything when present readings are lower', () => {
		const cal = calibrate({
			idle,
			present: { count: 1000, mean: 470, sigma: 4 },
			updateRateHz: 50
		});
		// threshold rule mirrored below idle: enter = 500 - 5 * 2, exit halfway back
		expect(cal.direction).toBe('down');
		expect([cal.enter, cal.exit]).toEqual([490, 495]);
		// NIST/SEMATECH e-Handbook normal table: P(Z>5)=2.86651572e-7
		expectRelative(cal.falseTriggerPerUpdate, 2.86651572e-7);
		// NIST/SEMATECH e-Handbook normal table: (490-470)/4 = 5 sigmas, P(Z>5)=2.86651572e-7
		expectRelative(cal.missProbability, 2.86651572e-7);
		// glossary: depth runs from the far edge to fully in, whichever way readings move
		expect(cal.depth).toEqual({ far: 495, near: 470 });
	});

	it('falls back to the balance point when the means are close', () => {
		// means 12 apart, both sigmas 2: the balance point is 3 sigmas from each mean
		const cal = calibrate({
			idle,
			present: { count: 1000, mean: 512, sigma: 2 },
			updateRateHz: 20
		});
		expect(cal.enter).toBe(506);
		expect(cal.enterSigmas).toBe(3);
		// NIST/SEMATECH e-Handbook normal table: P(Z>3)=0.00134989803 on both sides
		expectRelative(cal.falseTriggerPerUpdate, 0.00134989803);
		expectRelative(cal.missProbability, 0.00134989803);
		// P(Z>3) * 20/s * 3600 s = 97.19 false triggers per hour
		expectRelative(cal.falseTriggersPerHour!, 0.00134989803 * 20 * 3600);
		// more than 1 false trigger per hour is a warning (common practice, no published source)
		expect(cal.warnings.map((w) => w.code)).toEqual(['enter-at-balance', 'false-triggers']);
	});

	it('takes a different enter distance', () => {
		const cal = calibrate(
			{ idle: { count: 100, mean: 0, sigma: 1 }, present: { count: 100, mean: 10, sigma: 1 } },
			{ enterSigmas: 4 }
		);
		// NIST/SEMATECH e-Handbook normal table: P(Z>4)=3.16712418e-5 and (10-4)/1 = 6 sigmas, P(Z>6)=9.86587645e-10
		expectRelative(cal.falseTriggerPerUpdate, 3.16712418e-5);
		expectRelative(cal.missProbability, 9.86587645e-10);
		// false triggers per hour need an update rate, and none was given
		expect(cal.falseTriggersPerHour).toBeNull();
	});

	it('warns when the separation is too small to calibrate', () => {
		// d' = 2 / sqrt((2^2 + 2^2) / 2) = 1, far below 3 (common practice, no published source)
		const cal = calibrate({
			idle,
			present: { count: 1000, mean: 502, sigma: 2 },
			updateRateHz: 50
		});
		expect(cal.separation).toBeCloseTo(1, 12);
		// warning limits, common practice, no published source: d' < 3, > 1 per hour, > 1 % misses
		expect(cal.warnings.map((w) => w.code)).toEqual([
			'enter-at-balance',
			'low-separation',
			'false-triggers',
			'misses'
		]);
		// NIST/SEMATECH e-Handbook normal table: balance point at z = 0.5, P(Z>0.5)=0.308537539 (memory)
		expectRelative(cal.missProbability, 0.308537539);
	});

	it('warns about few readings, quantised sigma and drift', () => {
		const cal = calibrate(
			{
				idle: { count: 20, mean: 1000, sigma: 0 },
				present: { count: 20, mean: 1100, sigma: 10 },
				updateRateHz: 50,
				driftPerMinute: 0.5,
				// t = 0.5 / 0.05 = 10 on 18 degrees of freedom, far above t(18) = 2.101 (5 % level)
				driftStandardErrorPerMinute: 0.05,
				driftDegreesOfFreedom: 18
			},
			{ resolution: 1 }
		);
		// quantisation noise of a uniform step q is q/sqrt(12)
		expect(cal.idleSigma).toBeCloseTo(1 / Math.sqrt(12), 15);
		// fewer than 30 readings per label (common practice, no published source); 0.5 per minute for
		// 60 minutes = 30 counts, past the exit offset of 2.5 * 0.2887 (common practice horizon)
		expect(cal.warnings.map((w) => w.code)).toEqual([
			'few-readings',
			'few-readings',
			'sigma-floor',
			'drift'
		]);
		// the measured drift is passed through unchanged
		expect(cal.driftPerMinute).toBe(0.5);
		expect(cal.driftSignificant).toBe(true);
		const drift = cal.warnings.find((w) => w.code === 'drift')!.message;
		// exit offset 2.5 * 0.2887 = 0.7217 counts at 0.5 a minute: about 1.4 minutes
		expect(drift).toMatch(/^The idle reading rises by 0\.5 a minute.*in about 1\.4 minutes\./);
	});

	it('does not warn of a drift that its scatter explains', () => {
		const base = {
			idle: { count: 5000, mean: 1000, sigma: 2 },
			present: { count: 5000, mean: 1100, sigma: 2 },
			driftPerMinute: 0.5
		};
		// t = 0.5 / 0.4 = 1.25, below 1.96 (normal quantile, large degrees of freedom): not a drift
		const noisy = calibrate({
			...base,
			driftStandardErrorPerMinute: 0.4,
			driftDegreesOfFreedom: 4998
		});
		expect(noisy.driftSignificant).toBe(false);
		expect(noisy.warnings.map((w) => w.code)).not.toContain('drift');
		// t = 0.5 / 0.1 = 5: a drift, reaching the 5 count exit offset within the 60 minute horizon
		const real = calibrate({
			...base,
			driftStandardErrorPerMinute: 0.1,
			driftDegreesOfFreedom: 4998
		});
		expect(real.warnings.map((w) => w.code)).toContain('drift');
		// without a standard error nothing establishes the drift
		expect(calibrate(base).driftSignificant).toBe(false);
	});

	it('refuses statistics that are not finite, in words', () => {
		// readings near 1e308 overflow the variance to Infinity; an average of NaN is no average
		expect(() =>
			calibrate({
				idle: { count: 100, mean: 1e308, sigma: Infinity },
				present: { count: 100, mean: 900, sigma: 2 }
			})
		).toThrow(CalibrationInputError);
		expect(() => calibrate({ idle, present: { count: 100, mean: NaN, sigma: 1 } })).toThrow(
			/present readings are too large or too spread out/
		);
	});

	it('refuses a capture without both labels', () => {
		// a separation needs two groups
		expect(() => calibrate({ idle, present: { count: 0, mean: NaN, sigma: 0 } })).toThrow(
			RangeError
		);
	});
});

describe('depthOf', () => {
	// glossary: depth is 0 at the far edge of the trigger range and 1 fully in
	it('maps the far end to 0 and the near end to 1', () => {
		const mapping = { far: 505, near: 540 };
		expect(depthOf(505, mapping)).toBe(0);
		expect(depthOf(540, mapping)).toBe(1);
		expect(depthOf(522.5, mapping)).toBe(0.5);
	});

	it('clamps to 0..1 on both sides and for falling readings', () => {
		expect(depthOf(400, { far: 505, near: 540 })).toBe(0);
		expect(depthOf(600, { far: 505, near: 540 })).toBe(1);
		expect(depthOf(480, { far: 495, near: 470 })).toBe(0.6);
		expect(depthOf(460, { far: 495, near: 470 })).toBe(1);
		expect(depthOf(5, { far: 5, near: 5 })).toBe(0);
	});
});
