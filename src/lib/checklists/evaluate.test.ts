import { describe, expect, it } from 'vitest';
import { calibrate } from '$lib/calibration/calibrate';
import { evaluateSensorTest, type ReadingBand } from './evaluate';

// The band a designer stores when applying a capture: the calibration module's own numbers.
function bandFrom(present: { count: number; mean: number; sigma: number }): ReadingBand {
	const cal = calibrate({ idle: { count: 5000, mean: 500, sigma: 2 }, present, updateRateHz: 50 });
	return {
		direction: cal.direction,
		enter: cal.enter,
		exit: cal.exit,
		baselineLow: cal.baselineBand.low,
		baselineHigh: cal.baselineBand.high
	};
}

describe('evaluateSensorTest, readings rising with a hand', () => {
	// calibrate(): idle 500 ± 2, present 540 -> enter 510, exit 505, baseline band 495..505
	// (threshold rule, common practice, no published source; numbers from calibrate.test.ts)
	const up = bandFrom({ count: 1000, mean: 540, sigma: 5 });

	it('uses the calibration module numbers', () => {
		expect(up).toEqual({
			direction: 'up',
			enter: 510,
			exit: 505,
			baselineLow: 495,
			baselineHigh: 505
		});
	});

	it('passes an idle reading in the band and a present reading past enter', () => {
		const v = evaluateSensorTest(up, 501, 538);
		expect(v.outcome).toBe('pass');
		expect(v.reasons).toEqual([]);
	});

	it('counts the band ends and the enter threshold itself as inside', () => {
		expect(evaluateSensorTest(up, 495, 510).outcome).toBe('pass');
		expect(evaluateSensorTest(up, 505, 510).outcome).toBe('pass');
	});

	it('fails an idle reading that drifted out of the band', () => {
		const v = evaluateSensorTest(up, 506, 540);
		expect(v).toMatchObject({ outcome: 'fail', idleInBand: false, presentCrosses: true });
		expect(v.reasons[0]).toContain('above the baseline band 495 to 505');
	});

	it('fails a present reading short of enter', () => {
		const v = evaluateSensorTest(up, 500, 509.9);
		expect(v).toMatchObject({ outcome: 'fail', idleInBand: true, presentCrosses: false });
		expect(v.reasons[0]).toContain('510 or more');
	});

	it('fails missing readings instead of passing them', () => {
		expect(evaluateSensorTest(up, Number.NaN, 540).outcome).toBe('fail');
		expect(evaluateSensorTest(up, 500, Number.NaN).reasons).toEqual([
			'The present reading is missing.'
		]);
	});
});

describe('evaluateSensorTest, readings falling with a hand', () => {
	// calibrate(): idle 500 ± 2, present 470 -> 'down', enter 490, exit 495, band 495..505
	const down = bandFrom({ count: 1000, mean: 470, sigma: 4 });

	it('uses the calibration module numbers', () => {
		expect(down).toEqual({
			direction: 'down',
			enter: 490,
			exit: 495,
			baselineLow: 495,
			baselineHigh: 505
		});
	});

	it('passes a present reading at or below enter', () => {
		expect(evaluateSensorTest(down, 500, 490).outcome).toBe('pass');
		expect(evaluateSensorTest(down, 500, 471).outcome).toBe('pass');
	});

	it('fails a present reading above enter, even a high one', () => {
		// a reading far on the wrong side must not pass just for being far from idle
		expect(evaluateSensorTest(down, 500, 491).outcome).toBe('fail');
		expect(evaluateSensorTest(down, 500, 540).outcome).toBe('fail');
	});

	it('fails an idle reading below the band', () => {
		expect(evaluateSensorTest(down, 494, 480).reasons[0]).toContain('below the baseline band');
	});
});
