import { describe, expect, it } from 'vitest';
import { curveProblems } from './curve';
import { movePoint, nudgePoint } from './drag';

const pts = [
	{ x: 0, y: 0 },
	{ x: 0.25, y: 0.02 },
	{ x: 0.5, y: 0.15 },
	{ x: 1, y: 1 }
];

// A drawn curve must stay monotone for the Fritsch-Carlson interpolation to keep it from turning
// back (Fritsch & Carlson 1980, SIAM J. Numer. Anal. 17(2)); dragging must never break that.
describe('dragging a drawn point', () => {
	it('moves a point to where it is dropped, rounded as people type', () => {
		expect(movePoint(pts, 2, { x: 0.41234, y: 0.1 })[2]).toEqual({ x: 0.412, y: 0.1 });
	});

	it('keeps the point between its neighbours, so the curve stays valid', () => {
		const past = movePoint(pts, 1, { x: 0.9, y: 0.9 });
		expect(past[1]).toEqual({ x: 0.49, y: 0.15 });
		const below = movePoint(pts, 2, { x: 0.3, y: -2 });
		expect(below[2]).toEqual({ x: 0.3, y: 0.02 });
		expect(curveProblems({ kind: 'points', points: past })).toEqual([]);
		expect(curveProblems({ kind: 'points', points: below })).toEqual([]);
		// The ends stay inside 0..1.
		expect(movePoint(pts, 3, { x: 3, y: 3 })[3]).toEqual({ x: 1, y: 1 });
	});

	it('moves by arrow-key steps and leaves the other points alone', () => {
		const up = nudgePoint(pts, 1, 0, 0.01);
		expect(up[1]).toEqual({ x: 0.25, y: 0.03 });
		expect(up.filter((_, i) => i !== 1)).toEqual(pts.filter((_, i) => i !== 1));
		expect(nudgePoint(pts, 0, -0.01, 0)[0]).toEqual({ x: 0, y: 0 });
	});

	it('works when the points were typed out of order', () => {
		const shuffled = [pts[2], pts[0], pts[3], pts[1]];
		expect(movePoint(shuffled, 0, { x: 0.2, y: 0.5 })[0]).toEqual({ x: 0.26, y: 0.5 });
	});
});
