import { describe, expect, it } from 'vitest';
import { levelTableFor } from './level-table';

describe('levelTableFor', () => {
	it('uses the controller PWM frequency for the flicker check', () => {
		// Microcontroller datasheets: 16 MHz / (64 * 256) = 976.5625 Hz fast PWM
		const r = levelTableFor({ kind: 'linear' }, { clockHz: 16e6, prescaler: 64, pwmBits: 8 });
		expect(r.ok).toBe(true);
		if (!r.ok) return;
		expect(r.pwmHz).toBeCloseTo(976.5625, 9);
		// IEEE 1789-2015 (memory): at 976.6 Hz the low-risk limit is 0.08*f = 78 % < 100 % on/off PWM
		expect(r.flicker?.risk).toBe('not-low-risk');
		expect(r.table.counts[255]).toBe(255);
	});
	it('passes above 1250 Hz and falls back to 8 bits with no controller', () => {
		// IEEE 1789-2015 (memory): any modulation is low risk above 1250 Hz
		const fast = levelTableFor({ kind: 'cie' }, { clockHz: 16e6, prescaler: 1, pwmBits: 10 });
		expect(fast.ok && fast.flicker?.risk).toBe('low-risk');
		const none = levelTableFor({ kind: 'gamma', exponent: 2.2 }, null);
		expect(none.ok && none.table.bits).toBe(8);
		expect(none.ok && none.flicker).toBeNull();
	});
	it('refuses a curve with problems instead of throwing', () => {
		const r = levelTableFor({ kind: 'gamma', exponent: -1 }, null);
		expect(r.ok).toBe(false);
	});
});
