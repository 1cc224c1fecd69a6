import { luminanceFromLightness } from './lightness';

export type CurvePoint = { x: number; y: number };

export type BrightnessCurve =
	| { kind: 'linear' }
	| { kind: 'gamma'; exponent: number }
	| { kind: 'cie' }
	| { kind: 'points'; points: CurvePoint[] };

export type CurveKind = BrightnessCurve['kind'];

export function sortPoints(points: CurvePoint[]): CurvePoint[] {
	return [...points].sort((a, b) => a.x - b.x);
}

/** Everything wrong with a curve, in plain words; empty when it can be used. */
export function curveProblems(curve: BrightnessCurve): string[] {
	switch (curve.kind) {
		case 'linear':
		case 'cie':
			return [];
		case 'gamma':
			return Number.isFinite(curve.exponent) && curve.exponent > 0
				? []
				: [`gamma exponent ${curve.exponent} must be a number above 0`];
		case 'points':
			return pointProblems(curve.points);
	}
}

function pointProblems(points: CurvePoint[]): string[] {
	const problems: string[] = [];
	if (points.length < 2) problems.push('a drawn curve needs at least 2 points');
	for (const p of points) {
		if (!Number.isFinite(p.x) || p.x < 0 || p.x > 1)
			problems.push(`point x ${p.x} must be in 0..1`);
		if (!Number.isFinite(p.y) || p.y < 0 || p.y > 1)
			problems.push(`point y ${p.y} must be in 0..1`);
	}
	if (problems.length > 0) return problems;
	const sorted = sortPoints(points);
	for (let i = 1; i < sorted.length; i++) {
		if (sorted[i].x === sorted[i - 1].x) problems.push(`two points share x ${sorted[i].x}`);
		// A level table must never dim as the level rises.
		else if (sorted[i].y < sorted[i - 1].y)
			problems.push(`point at x ${sorted[i].x} is lower than the point before it`);
	}
	return problems;
}

/**
 * Monotone cubic Hermite interpolation by the Fritsch–Carlson method: tangents start as the mean
 * of neighbouring secants, are zeroed at flat spans and local extrema, and are scaled back into
 * the circle alpha^2 + beta^2 <= 9 so each piece stays monotone. Points must be sorted with x
 * strictly increasing. Outside the first and last x the end values hold.
 */
export function monotoneCubic(points: CurvePoint[]): (x: number) => number {
	const n = points.length;
	const xs = points.map((p) => p.x);
	const ys = points.map((p) => p.y);
	const h: number[] = [];
	const secant: number[] = [];
	for (let k = 0; k < n - 1; k++) {
		h.push(xs[k + 1] - xs[k]);
		secant.push((ys[k + 1] - ys[k]) / h[k]);
	}
	const m: number[] = new Array(n).fill(0);
	if (n > 1) {
		m[0] = secant[0];
		m[n - 1] = secant[n - 2];
	}
	for (let k = 1; k < n - 1; k++) {
		m[k] = secant[k - 1] * secant[k] <= 0 ? 0 : (secant[k - 1] + secant[k]) / 2;
	}
	for (let k = 0; k < n - 1; k++) {
		if (secant[k] === 0) {
			m[k] = 0;
			m[k + 1] = 0;
			continue;
		}
		const a = m[k] / secant[k];
		const b = m[k + 1] / secant[k];
		const r = a * a + b * b;
		if (r > 9) {
			const t = 3 / Math.sqrt(r);
			m[k] = t * a * secant[k];
			m[k + 1] = t * b * secant[k];
		}
	}
	return (x: number) => {
		if (n === 1 || x <= xs[0]) return ys[0];
		if (x >= xs[n - 1]) return ys[n - 1];
		let lo = 0;
		let hi = n - 1;
		while (hi - lo > 1) {
			const mid = (lo + hi) >> 1;
			if (xs[mid] <= x) lo = mid;
			else hi = mid;
		}
		const t = (x - xs[lo]) / h[lo];
		const t2 = t * t;
		const t3 = t2 * t;
		return (
			(2 * t3 - 3 * t2 + 1) * ys[lo] +
			(t3 - 2 * t2 + t) * h[lo] * m[lo] +
			(-2 * t3 + 3 * t2) * ys[lo + 1] +
			(t3 - t2) * h[lo] * m[lo + 1]
		);
	};
}

function clampUnit(value: number): number {
	return value < 0 ? 0 : value > 1 ? 1 : value;
}

/**
 * The curve as a function from level 0..1 to relative duty 0..1, with any set-up done once.
 * Levels outside 0..1 are clamped; a curve with problems throws a RangeError.
 */
export function curveFunction(curve: BrightnessCurve): (level: number) => number {
	const problems = curveProblems(curve);
	if (problems.length > 0) throw new RangeError(problems.join('; '));
	let shape: (level: number) => number;
	switch (curve.kind) {
		case 'linear':
			shape = (level) => level;
			break;
		case 'gamma': {
			const exponent = curve.exponent;
			shape = (level) => level ** exponent;
			break;
		}
		case 'cie':
			shape = (level) => luminanceFromLightness(100 * level);
			break;
		case 'points':
			shape = monotoneCubic(sortPoints(curve.points));
			break;
	}
	return (level) => {
		if (!Number.isFinite(level)) throw new RangeError(`level ${level} is not a number`);
		return clampUnit(shape(clampUnit(level)));
	};
}

/** Relative duty 0..1 for a level 0..1. Use curveFunction when applying one curve many times. */
export function applyCurve(curve: BrightnessCurve, level: number): number {
	return curveFunction(curve)(level);
}

export function describeCurve(curve: BrightnessCurve): string {
	switch (curve.kind) {
		case 'linear':
			return 'linear';
		case 'gamma':
			return `gamma ${curve.exponent}`;
		case 'cie':
			return 'CIE 1976 lightness';
		case 'points':
			return `drawn points (${curve.points.length})`;
	}
}
