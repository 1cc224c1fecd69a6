import { describe, expect, it } from 'vitest';
import type { BrightnessCurve } from './curve';
import { buildLevelTable, reviewLevelTable, VISIBLE_STEP_LIGHTNESS } from './level-table';

const KAPPA = 24389 / 27;

describe('buildLevelTable', () => {
	it('quantises the CIE curve at mid lightness', () => {
		// CIE 015:2004: L*=50 -> Y=0.1841865185; 255 * Y = 46.97 -> 47 at 8 bits
		expect(buildLevelTable({ kind: 'cie' }, { bits: 8, levels: 101 }).counts[50]).toBe(47);
		// CIE 015:2004: 65535 * 0.1841865185 = 12070.66 -> 12071 at 16 bits
		expect(buildLevelTable({ kind: 'cie' }, { bits: 16, levels: 101 }).counts[50]).toBe(12071);
	});

	it('runs from 0 to the largest count of the PWM width', () => {
		// ISO/IEC 9899 §7.20.2.1: UINT8_MAX = 255, UINT16_MAX = 65535 (largest 8- and 16-bit counts)
		const t8 = buildLevelTable({ kind: 'linear' }, { bits: 8 });
		expect([t8.maxCount, t8.counts[0], t8.counts[255], t8.counts.length]).toEqual([
			255, 0, 255, 256
		]);
		const t16 = buildLevelTable({ kind: 'gamma', exponent: 2.2 }, { bits: 16 });
		expect([t16.maxCount, t16.counts[255]]).toEqual([65535, 65535]);
	});

	it('matches the power law entry by entry', () => {
		// power law duty = level^2.2, worked here for each of 256 levels at 12 bits
		const table = buildLevelTable({ kind: 'gamma', exponent: 2.2 }, { bits: 12 });
		const expected = Array.from({ length: 256 }, (_, i) => Math.round((i / 255) ** 2.2 * 4095));
		expect(table.counts).toEqual(expected);
	});

	it('never decreases, for every curve kind and width', () => {
		// Fritsch & Carlson 1980, CIE 015:2004 and the power law are all non-decreasing, so tables must be
		const curves: BrightnessCurve[] = [
			{ kind: 'linear' },
			{ kind: 'gamma', exponent: 2.8 },
			{ kind: 'cie' },
			{
				kind: 'points',
				points: [
					{ x: 0, y: 0 },
					{ x: 0.2, y: 0.01 },
					{ x: 0.5, y: 0.02 },
					{ x: 0.8, y: 0.7 },
					{ x: 1, y: 1 }
				]
			}
		];
		for (const curve of curves) {
			for (let bits = 8; bits <= 16; bits++) {
				const { counts } = buildLevelTable(curve, { bits, levels: 1024 });
				const drops = counts.filter((c, i) => i > 0 && c < counts[i - 1]).length;
				expect(drops, `${curve.kind} at ${bits} bits`).toBe(0);
			}
		}
	});

	it('refuses widths and level counts out of range', () => {
		// design: PWM bits 8..16
		expect(() => buildLevelTable({ kind: 'linear' }, { bits: 7 })).toThrow(RangeError);
		expect(() => buildLevelTable({ kind: 'linear' }, { bits: 17 })).toThrow(RangeError);
		expect(() => buildLevelTable({ kind: 'linear' }, { bits: 12.5 })).toThrow(RangeError);
		expect(() => buildLevelTable({ kind: 'linear' }, { bits: 8, levels: 1 })).toThrow(RangeError);
	});
});

describe('reviewLevelTable', () => {
	it('flags the dark end of a linear 8-bit table', () => {
		const review = reviewLevelTable(buildLevelTable({ kind: 'linear' }, { bits: 8 }));
		// CIE 015:2004: below Y = eps, L* = kappa * Y, so counts 1 -> 2 of 255 step kappa/255 = 3.542 L*
		expect(review.coarseSteps[0]).toEqual({
			index: 2,
			fromCount: 1,
			toCount: 2,
			lightnessStep: expect.closeTo(KAPPA / 255, 10)
		});
		// CIE 015:2004: count 1 of 255 is L* = kappa/255 = 3.542, more than the visible step
		expect(review.firstLitLightness).toBeCloseTo(KAPPA / 255, 10);
		expect(review.warnings.map((w) => w.code)).toEqual(['first-step', 'coarse-steps']);
		// CIE 015:2004 formula worked here: every coarse step really is above the threshold
		const lstar = (y: number) => (y > 216 / 24389 ? 116 * Math.cbrt(y) - 16 : KAPPA * y);
		for (const step of review.coarseSteps)
			expect(lstar(step.toCount / 255) - lstar(step.fromCount / 255)).toBeGreaterThan(
				VISIBLE_STEP_LIGHTNESS
			);
	});

	it('finds no coarse steps in a 16-bit CIE table of 256 levels', () => {
		// CIE 015:2004: the CIE curve spaces levels evenly in L*, 100/255 = 0.39 L* apart
		const review = reviewLevelTable(buildLevelTable({ kind: 'cie' }, { bits: 16 }));
		expect(review.coarseSteps).toEqual([]);
		expect(review.firstLitIndex).toBe(1);
		// CIE 015:2004: L* = 100/255 is on the straight segment, Y = L*/kappa = 28.45 of 65535 -> 28
		expect(review.firstLitLightness).toBeCloseTo((28 / 65535) * KAPPA, 12);
		expect(review.warnings).toEqual([]);
	});

	it('reports levels that stay off at the dark end of a gamma table', () => {
		// power law worked here: levels whose 255 * (i/255)^2.2 rounds to 0
		const off = Array.from({ length: 256 }, (_, i) => i).filter(
			(i) => Math.round((i / 255) ** 2.2 * 255) === 0
		);
		const review = reviewLevelTable(buildLevelTable({ kind: 'gamma', exponent: 2.2 }, { bits: 8 }));
		expect(review.collapsed[0]).toEqual({ fromIndex: 0, toIndex: off.length - 1, count: 0 });
		expect(review.firstLitIndex).toBe(off.length);
		expect(review.warnings.find((w) => w.code === 'dark-levels-off')?.message).toBe(
			`levels 0 to ${off.length - 1} all give count 0, so the light stays off until level ${off.length}`
		);
	});

	it('counts input levels that collapse onto one count', () => {
		// pigeonhole: 1024 input levels onto the 256 counts of a linear 8-bit table repeat 768 times
		const review = reviewLevelTable(buildLevelTable({ kind: 'linear' }, { bits: 8, levels: 1024 }));
		const repeats = review.collapsed.reduce((sum, run) => sum + run.toIndex - run.fromIndex, 0);
		expect(repeats).toBe(768);
		expect(review.warnings.map((w) => w.code)).toContain('collapsed-levels');
	});
});
