import type { CurvePoint } from './curve';

export type { CurvePoint };

const GAP = 0.01;
const round = (v: number) => Math.round(v * 1000) / 1000;
const clamp = (v: number, lo: number, hi: number) => Math.min(hi, Math.max(lo, v));

/**
 * Moves one drawn point towards a wanted place, keeping the curve valid: inside 0..1, strictly
 * between its neighbours' levels (by level, whatever order they were typed in) and no lower than
 * the point before nor higher than the point after, so the curve never dims as the level rises.
 * Values are rounded to 3 decimals, as people type them. Other points are untouched.
 */
export function movePoint(points: CurvePoint[], index: number, to: CurvePoint): CurvePoint[] {
	const me = points[index];
	if (!me) return points;
	let before: CurvePoint | null = null;
	let after: CurvePoint | null = null;
	for (const [i, p] of points.entries()) {
		if (i === index) continue;
		if (p.x < me.x && (!before || p.x > before.x)) before = p;
		if (p.x > me.x && (!after || p.x < after.x)) after = p;
	}
	const x = clamp(
		Number.isFinite(to.x) ? to.x : me.x,
		before ? before.x + GAP : 0,
		after ? after.x - GAP : 1
	);
	const y = clamp(Number.isFinite(to.y) ? to.y : me.y, before ? before.y : 0, after ? after.y : 1);
	const moved = { x: round(clamp(x, 0, 1)), y: round(clamp(y, 0, 1)) };
	return points.map((p, i) => (i === index ? moved : p));
}

/** Moves a point by a step (arrow keys), with the same limits as dragging. */
export function nudgePoint(points: CurvePoint[], index: number, dx: number, dy: number) {
	const me = points[index];
	if (!me) return points;
	return movePoint(points, index, { x: me.x + dx, y: me.y + dy });
}
