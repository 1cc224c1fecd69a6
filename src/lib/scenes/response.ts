import type { Response } from './types';

const clamp = (n: number) => Math.min(1, Math.max(0, n));

/** Drawn points, sorted by depth, with anything unusable left out. */
export function responsePoints(points: [number, number][] | null | undefined): [number, number][] {
	return (points ?? [])
		.filter(([d, l]) => Number.isFinite(d) && Number.isFinite(l))
		.map(([d, l]) => [clamp(d), clamp(l)] as [number, number])
		.sort((a, b) => a[0] - b[0]);
}

/**
 * An output's level (0..1, before its brightness curve) for a sensor depth (0..1) through a
 * response's shape. Points are joined by straight lines; outside them the end levels hold.
 */
export function responseLevel(response: Response, depth: number): number {
	const d = clamp(Number.isFinite(depth) ? depth : 0);
	const low = clamp(response.minLevel ?? 0);
	const high = clamp(response.maxLevel ?? 1);
	switch (response.shape ?? 'rise') {
		case 'rise':
			return low + (high - low) * d;
		case 'fall':
			return high - (high - low) * d;
		case 'step':
			return d >= (response.threshold ?? 0.5) ? high : low;
		case 'points': {
			const pts = responsePoints(response.points);
			if (pts.length === 0) return low;
			if (d <= pts[0][0]) return pts[0][1];
			for (let i = 1; i < pts.length; i++) {
				const [d1, l1] = pts[i];
				if (d <= d1) {
					const [d0, l0] = pts[i - 1];
					return d1 === d0 ? l1 : l0 + ((l1 - l0) * (d - d0)) / (d1 - d0);
				}
			}
			return pts[pts.length - 1][1];
		}
	}
}

/** The levels a response's line turns at: its lowest and highest are what a guest can reach. */
export function responseLevels(response: Response): number[] {
	if (response.shape === 'points') {
		const pts = responsePoints(response.points);
		return pts.length ? pts.map((p) => p[1]) : [clamp(response.minLevel ?? 0)];
	}
	return [clamp(response.minLevel ?? 0), clamp(response.maxLevel ?? 1)];
}

/** Depth spans this small are within a calibrated reading's wavering (common practice). */
export const JUMP_DEPTH_SPAN = 0.05;

/**
 * Where a response changes level all at once: a step at its threshold, or a drawn line whose
 * level changes across no more than JUMP_DEPTH_SPAN of depth.
 */
export function responseJumps(response: Response): { depth: number; low: number; high: number }[] {
	const shape = response.shape ?? 'rise';
	const low = clamp(response.minLevel ?? 0);
	const high = clamp(response.maxLevel ?? 1);
	if (shape === 'step') {
		const depth = clamp(response.threshold ?? 0.5);
		return low === high ? [] : [{ depth, low: Math.min(low, high), high: Math.max(low, high) }];
	}
	if (shape !== 'points') return [];
	const pts = responsePoints(response.points);
	const jumps: { depth: number; low: number; high: number }[] = [];
	for (let i = 1; i < pts.length; i++) {
		const [[d0, l0], [d1, l1]] = [pts[i - 1], pts[i]];
		if (l0 !== l1 && d1 - d0 <= JUMP_DEPTH_SPAN)
			jumps.push({ depth: (d0 + d1) / 2, low: Math.min(l0, l1), high: Math.max(l0, l1) });
	}
	return jumps;
}

/** The highest level a guest can drive a response to, at any depth. */
export function responseMaxLevel(response: Response): number {
	return Math.max(...responseLevels(response));
}
