import { describe, expect, it } from 'vitest';
import {
	applyCurve,
	curveFunction,
	curveProblems,
	describeCurve,
	monotoneCubic,
	type BrightnessCurve,
	type CurvePoint
} from './curve';

// Fritsch & Carlson 1980, RPN 14 data (memory), x rescaled from 7.99..20 onto 0..1.
const RPN14_X = [7.99, 8.09, 8.19, 8.7, 9.2, 10, 12, 15, 20];
const RPN14_Y = [
	0, 2.76429e-5, 4.37498e-2, 0.169183, 0.469428, 0.94374, 0.998636, 0.999919, 0.999994
];
const RPN14: CurvePoint[] = RPN14_X.map((x, i) => ({ x: (x - 7.99) / (20 - 7.99), y: RPN14_Y[i] }));

describe('published curves', () => {
	it('linear passes the level through', () => {
		// definition of a linear curve: duty = level
		expect(applyCurve({ kind: 'linear' }, 0.3)).toBe(0.3);
	});

	it('gamma raises the level to the exponent', () => {
		// power law duty = level^2.2: 0.5^2.2 = 0.2176376408 (memory)
		expect(applyCurve({ kind: 'gamma', exponent: 2.2 }, 0.5)).toBeCloseTo(0.2176376408, 9);
		// power law: 0 and 1 are fixed points for any exponent
		expect(applyCurve({ kind: 'gamma', exponent: 2.8 }, 1)).toBe(1);
	});

	it('CIE lightness treats the level as L*/100', () => {
		// CIE 015:2004: L*=50 -> Y=0.1841865185
		expect(applyCurve({ kind: 'cie' }, 0.5)).toBeCloseTo(0.1841865185, 10);
		// CIE 015:2004: L*=8 -> Y = 216/24389 = 0.0088564517
		expect(applyCurve({ kind: 'cie' }, 0.08)).toBeCloseTo(0.0088564517, 10);
		// CIE 015:2004: L*=0 -> 0 and L*=100 -> 1
		expect(applyCurve({ kind: 'cie' }, 0)).toBe(0);
		expect(applyCurve({ kind: 'cie' }, 1)).toBeCloseTo(1, 14);
	});

	it('clamps levels outside 0..1 and refuses non-numbers', () => {
		// CIE 015:2004: L* stops at 100 (Y=1) and 0 (Y=0)
		expect(applyCurve({ kind: 'cie' }, 1.5)).toBeCloseTo(1, 14);
		expect(applyCurve({ kind: 'cie' }, -0.2)).toBe(0);
		expect(() => applyCurve({ kind: 'linear' }, NaN)).toThrow(RangeError);
	});

	it('describes each kind', () => {
		// glossary: published curves keep their names
		expect(describeCurve({ kind: 'cie' })).toBe('CIE 1976 lightness');
		expect(describeCurve({ kind: 'gamma', exponent: 2.2 })).toBe('gamma 2.2');
	});
});

describe('drawn points (Fritsch–Carlson)', () => {
	const rpn = monotoneCubic(RPN14);

	it('passes through every point', () => {
		// Fritsch & Carlson 1980: the interpolant takes the data values at the data points
		for (const p of RPN14) expect(rpn(p.x)).toBeCloseTo(p.y, 12);
	});

	it('keeps monotone data monotone', () => {
		// Fritsch & Carlson 1980: monotone data stays monotone (RPN 14, where plain cubic splines wiggle)
		let previous = rpn(0);
		for (let i = 1; i <= 10000; i++) {
			const y = rpn(i / 10000);
			expect(y).toBeGreaterThanOrEqual(previous);
			previous = y;
		}
		expect(previous).toBeLessThanOrEqual(1);
	});

	it('stays within each interval of the data', () => {
		// Fritsch & Carlson 1980: a monotone piece stays between its end values
		for (let k = 0; k < RPN14.length - 1; k++) {
			for (let j = 1; j < 20; j++) {
				const x = RPN14[k].x + ((RPN14[k + 1].x - RPN14[k].x) * j) / 20;
				expect(rpn(x)).toBeGreaterThanOrEqual(RPN14[k].y - 1e-15);
				expect(rpn(x)).toBeLessThanOrEqual(RPN14[k + 1].y + 1e-15);
			}
		}
	});

	it('does not overshoot a peak in the data', () => {
		// Fritsch & Carlson 1980: the tangent is zero where the secants change sign, so a peak stays the peak
		const f = monotoneCubic([
			{ x: 0, y: 0 },
			{ x: 0.3, y: 1 },
			{ x: 1, y: 0.5 }
		]);
		let highest = 0;
		for (let x = 0; x <= 1; x += 0.001) highest = Math.max(highest, f(x));
		expect(highest).toBeLessThanOrEqual(1);
	});

	it('holds flat spans flat', () => {
		// Fritsch & Carlson 1980: where two neighbouring values are equal the piece is constant
		const f = monotoneCubic([
			{ x: 0, y: 0 },
			{ x: 0.4, y: 0.5 },
			{ x: 0.6, y: 0.5 },
			{ x: 1, y: 1 }
		]);
		for (let x = 0.4; x <= 0.6; x += 0.01) expect(f(x)).toBeCloseTo(0.5, 14);
	});

	it('reproduces a straight line', () => {
		// cubic Hermite interpolation: equal secants give tangents equal to the slope, so a line stays a line
		const f = monotoneCubic([
			{ x: 0, y: 0.1 },
			{ x: 0.3, y: 0.31 },
			{ x: 0.7, y: 0.59 },
			{ x: 1, y: 0.8 }
		]);
		for (let x = 0; x <= 1; x += 0.05) expect(f(x)).toBeCloseTo(0.1 + 0.7 * x, 12);
	});

	it('sorts the points and holds the end values outside them', () => {
		// Fritsch & Carlson 1980 needs ordered abscissae; the ends hold flat (our rule for levels outside)
		const curve: BrightnessCurve = {
			kind: 'points',
			points: [
				{ x: 0.9, y: 0.8 },
				{ x: 0.1, y: 0.05 },
				{ x: 0.5, y: 0.3 }
			]
		};
		const f = curveFunction(curve);
		expect(f(0.5)).toBeCloseTo(0.3, 14);
		expect(f(0)).toBe(0.05);
		expect(f(1)).toBe(0.8);
	});
});

describe('curveProblems', () => {
	it('accepts good curves', () => {
		// CIE 015:2004 and the power law need no settings beyond a positive exponent
		expect(curveProblems({ kind: 'cie' })).toEqual([]);
		expect(curveProblems({ kind: 'gamma', exponent: 2.2 })).toEqual([]);
		expect(curveProblems({ kind: 'points', points: RPN14 })).toEqual([]);
	});

	it('names what is wrong', () => {
		// power law: a zero or negative exponent is not a brightness curve
		expect(curveProblems({ kind: 'gamma', exponent: 0 })).toEqual([
			'gamma exponent 0 must be a number above 0'
		]);
		// Fritsch & Carlson 1980 needs strictly increasing x; our levels and duties live in 0..1
		const points = (...p: [number, number][]) => ({
			kind: 'points' as const,
			points: p.map(([x, y]) => ({ x, y }))
		});
		expect(curveProblems(points([0, 0]))).toEqual(['a drawn curve needs at least 2 points']);
		expect(curveProblems(points([0, 0], [0.5, 0.2], [0.5, 0.4]))).toEqual([
			'two points share x 0.5'
		]);
		expect(curveProblems(points([0, 0], [1.2, 1]))).toEqual(['point x 1.2 must be in 0..1']);
		expect(curveProblems(points([0, -0.1], [1, 1]))).toEqual(['point y -0.1 must be in 0..1']);
		expect(curveProblems(points([0, 0.5], [1, 0.2]))).toEqual([
			'point at x 1 is lower than the point before it'
		]);
		expect(() => applyCurve(points([0, 0.5], [1, 0.2]), 0.5)).toThrow(RangeError);
	});
});
