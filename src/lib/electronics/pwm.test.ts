import { describe, expect, it } from 'vitest';
import { pwmFrequency, pwmFrequencyForBits, topForFrequency } from './pwm';
import type { Result } from './result';

function value<T>(result: Result<T>): T {
	if (!result.ok) expect.fail(JSON.stringify(result.issues));
	return result.value;
}

describe('pwmFrequencyForBits', () => {
	it('gives 976.5625 Hz fast PWM at 16 MHz, N = 64, 8 bits', () => {
		// 8-bit microcontroller datasheet timer formula: 16 MHz, N=64 -> 976.5625 Hz fast PWM
		expect(value(pwmFrequencyForBits({ clockHz: 16e6, prescaler: 64, bits: 8 }))).toBe(976.5625);
	});

	it('gives 490.196 Hz phase-correct PWM at 16 MHz, N = 64, 8 bits', () => {
		// 8-bit microcontroller datasheet timer formula: 16 MHz, N=64 -> 490.196 Hz phase-correct
		const f = value(
			pwmFrequencyForBits({ clockHz: 16e6, prescaler: 64, bits: 8, mode: 'phase-correct' })
		);
		expect(f).toBeCloseTo(490.196, 3);
		// microcontroller datasheet: f_clk/(N*510) for 8 bits
		expect(f).toBeCloseTo(16e6 / (64 * 510), 9);
	});

	it('follows f_clk/(N*2^bits) for wider counters', () => {
		// microcontroller datasheet timer formula, fast mode, 10 and 16 bits
		expect(value(pwmFrequencyForBits({ clockHz: 16e6, prescaler: 1, bits: 10 }))).toBeCloseTo(
			16e6 / 1024,
			9
		);
		expect(value(pwmFrequencyForBits({ clockHz: 8e6, bits: 16 }))).toBeCloseTo(8e6 / 65536, 9);
		// microcontroller datasheet timer formula, phase-correct: f_clk/(N*(2*2^bits - 2))
		expect(
			value(pwmFrequencyForBits({ clockHz: 16e6, bits: 10, mode: 'phase-correct' }))
		).toBeCloseTo(16e6 / (2 * 1024 - 2), 9);
	});

	it('rejects a zero-bit counter', () => {
		// microcontroller datasheet: a counter has at least one bit
		expect(pwmFrequencyForBits({ clockHz: 16e6, bits: 0 }).ok).toBe(false);
	});
});

describe('pwmFrequency', () => {
	it('follows f_clk/(N*(1+TOP))', () => {
		// microcontroller datasheet timer formula: TOP = 255 is the 8-bit case, 976.5625 Hz
		expect(value(pwmFrequency({ clockHz: 16e6, prescaler: 64, top: 255 }))).toBe(976.5625);
		// microcontroller datasheet timer formula: 16 MHz / (8 x 2000) = 1 kHz
		expect(value(pwmFrequency({ clockHz: 16e6, prescaler: 8, top: 1999 }))).toBe(1000);
		// microcontroller datasheet timer formula, phase-correct: f_clk/(2*N*TOP)
		expect(
			value(pwmFrequency({ clockHz: 16e6, prescaler: 8, top: 1000, mode: 'phase-correct' }))
		).toBe(1000);
	});

	it('rejects a bad clock, prescaler or TOP', () => {
		// microcontroller datasheet: positive clock, whole-number prescaler and TOP
		const r = pwmFrequency({ clockHz: -1, prescaler: 0, top: 0.5 });
		if (r.ok) expect.fail('expected input issues');
		expect(r.issues.map((i) => i.field)).toEqual(['clockHz', 'prescaler', 'top']);
	});
});

describe('topForFrequency', () => {
	it('finds the TOP for a target frequency', () => {
		// microcontroller datasheet timer formula: 16 MHz / (8 x (1 + 1999)) = 1 kHz
		const fast = value(topForFrequency({ clockHz: 16e6, prescaler: 8, targetHz: 1000 }));
		expect(fast.top).toBe(1999);
		expect(fast.frequencyHz).toBe(1000);
		expect(fast.resolutionBits).toBeCloseTo(Math.log2(2000), 12);
		// microcontroller datasheet timer formula, phase-correct: 16 MHz / (2 x 8 x 1000) = 1 kHz
		const phase = value(
			topForFrequency({ clockHz: 16e6, prescaler: 8, targetHz: 1000, mode: 'phase-correct' })
		);
		expect(phase.top).toBe(1000);
	});

	it('rounds to the closest reachable frequency', () => {
		// microcontroller datasheet timer formula: 16 MHz / 25 kHz = 640 ticks -> TOP 639
		const r = value(topForFrequency({ clockHz: 16e6, targetHz: 25000 }));
		expect(r.top).toBe(639);
		// microcontroller datasheet timer formula: 16 MHz / 3 kHz = 5333.3 ticks: TOP 5332 gives 16e6/5333 Hz, nearest to 3 kHz
		const odd = value(topForFrequency({ clockHz: 16e6, targetHz: 3000 }));
		expect(odd.top).toBe(5332);
		expect(odd.frequencyHz).toBeCloseTo(16e6 / 5333, 9);
	});

	it('says when the target is out of reach', () => {
		// microcontroller datasheet timer formula: 1 Hz needs TOP 15 999 999, beyond 16 bits
		const low = topForFrequency({ clockHz: 16e6, targetHz: 1 });
		if (low.ok) expect.fail('expected input issues');
		expect(low.issues[0].message).toMatch(/too low/);
		// microcontroller datasheet timer formula: 20 MHz is above the 16 MHz clock
		const high = topForFrequency({ clockHz: 16e6, targetHz: 20e6 });
		if (high.ok) expect.fail('expected input issues');
		expect(high.issues[0].message).toMatch(/too high/);
	});
});
