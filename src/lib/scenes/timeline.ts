import { responseLevel } from './response';
import type { Cue, OutputKind, Scene } from './types';

/** Above this a flicker is PWM territory, not a cue. */
export const MAX_STROBE_HZ = 100;

export interface TimelinePoint {
	tMs: number;
	level: number;
}

export interface LevelOptions {
	/** Relays only switch: any level above 0 reads as 1, and a fade switches at its end. */
	kind?: OutputKind;
	/** Sensor depths 0..1 by sensor id, to include responses (the higher of timeline and response wins). */
	depths?: Record<string, number>;
}

type Side = 'left' | 'right';

const isLevel = (n: number) => Number.isFinite(n) && n >= 0 && n <= 1;

/** How long a cue acts; a set is instant. */
export function cueDurationMs(cue: Cue): number {
	return cue.action.type === 'set' ? 0 : cue.action.durationMs;
}

export function cueEndMs(cue: Cue): number {
	return cue.startMs + cueDurationMs(cue);
}

/** What is wrong with a cue's numbers, or null. */
export function cueProblem(cue: Cue): string | null {
	const a = cue.action;
	if (!Number.isFinite(cue.startMs) || cue.startMs < 0) return 'its start must be 0 s or later';
	if ((a.type === 'set' || a.type === 'fade' || a.type === 'strobe') && !isLevel(a.level)) {
		return 'its level must be between 0 and 1';
	}
	if (a.type === 'fade' && !(Number.isFinite(a.durationMs) && a.durationMs >= 0)) {
		return 'its length must be 0 s or more';
	}
	if (
		(a.type === 'pulse' || a.type === 'strobe') &&
		!(Number.isFinite(a.durationMs) && a.durationMs > 0)
	) {
		return 'its length must be more than 0 s';
	}
	if (a.type === 'strobe' && !(a.rateHz > 0 && a.rateHz <= MAX_STROBE_HZ)) {
		return `its rate must be above 0 and at most ${MAX_STROBE_HZ} Hz`;
	}
	return null;
}

/** The valid cues of one output in start order (ties keep their order in the scene). */
export function cuesFor(scene: Scene, outputId: string): Cue[] {
	return scene.cues
		.filter((cue) => cue.outputId === outputId && cueProblem(cue) === null)
		.map((cue, index) => ({ cue, index }))
		.sort((a, b) => a.cue.startMs - b.cue.startMs || a.index - b.index)
		.map(({ cue }) => cue);
}

/** The half period of a strobe at time t (right side) or just before t (left side). */
function strobeHalf(cue: Cue & { action: { type: 'strobe' } }, t: number, side: Side): number {
	const x = ((t - cue.startMs) * 2 * cue.action.rateHz) / 1000;
	// A tolerance so that boundaries computed in floating point land on the right half.
	return side === 'right' ? Math.floor(x + 1e-9) : Math.ceil(x - 1e-9) - 1;
}

/**
 * The level from the first `count` cues at time t. Each cue takes over from earlier ones; a pulse or
 * strobe hands back to the rest of the timeline when it ends. The left side is the limit just before t.
 */
function evaluate(cues: Cue[], count: number, t: number, side: Side, relay: boolean): number {
	for (let i = count - 1; i >= 0; i--) {
		const cue = cues[i];
		const started = side === 'right' ? cue.startMs <= t : cue.startMs < t;
		if (!started) continue;
		const end = cueEndMs(cue);
		const ended = side === 'right' ? t >= end : t > end;
		const a = cue.action;
		if (a.type === 'set') return a.level;
		if (a.type === 'fade') {
			if (ended) return a.level;
			const from = evaluate(cues, i, cue.startMs, 'right', relay);
			if (relay) return from;
			return from + ((a.level - from) * (t - cue.startMs)) / a.durationMs;
		}
		if (ended) continue;
		if (a.type === 'pulse') return 1;
		return strobeHalf(cue as Cue & { action: { type: 'strobe' } }, t, side) % 2 === 0 ? a.level : 0;
	}
	return 0;
}

function finish(level: number, relay: boolean): number {
	const clamped = Math.min(1, Math.max(0, level));
	return relay ? (clamped > 0 ? 1 : 0) : clamped;
}

/** An output's level (0..1) at a time on the scene's timeline; outputs rest at 0 before any cue. */
export function levelAt(
	scene: Scene,
	outputId: string,
	tMs: number,
	options: LevelOptions = {}
): number {
	const relay = options.kind === 'relay';
	const cues = cuesFor(scene, outputId);
	let level = evaluate(cues, cues.length, tMs, 'right', relay);
	for (const response of scene.responses ?? []) {
		const depth = options.depths?.[response.sensorId];
		if (response.outputId !== outputId || depth === undefined || !Number.isFinite(depth)) continue;
		level = Math.max(level, responseLevel(response, depth));
	}
	return finish(level, relay);
}

/** Where the timeline stops: the scene's length, or later if a cue runs past it. */
export function timelineEndMs(scene: Scene): number {
	const ends = scene.cues.filter((cue) => cueProblem(cue) === null).map(cueEndMs);
	return Math.max(scene.lengthMs, ...ends);
}

/** Times where an output's level can change direction or jump. */
function breakpoints(cues: Cue[], endMs: number): number[] {
	const times = new Set<number>([0, endMs]);
	for (const cue of cues) {
		times.add(cue.startMs);
		times.add(cueEndMs(cue));
		if (cue.action.type === 'strobe') {
			const half = 500 / cue.action.rateHz;
			for (let k = 1; k * half < cue.action.durationMs - 1e-9; k++)
				times.add(cue.startMs + k * half);
		}
	}
	return [...times].filter((t) => t <= endMs).sort((a, b) => a - b);
}

/**
 * An output's timeline without responses as points joined by straight lines; a jump shows as two
 * points at the same time (before, then after). Exact at every cue edge, so analysis needs no sampling.
 */
export function timelinePoints(
	scene: Scene,
	outputId: string,
	options: { kind?: OutputKind; endMs?: number } = {}
): TimelinePoint[] {
	const relay = options.kind === 'relay';
	const cues = cuesFor(scene, outputId);
	const endMs = options.endMs ?? timelineEndMs(scene);
	const points: TimelinePoint[] = [];
	const push = (tMs: number, level: number) => {
		const last = points.at(-1);
		if (!last || last.tMs !== tMs || last.level !== level) points.push({ tMs, level });
	};
	for (const t of breakpoints(cues, endMs)) {
		push(t, t === 0 ? 0 : finish(evaluate(cues, cues.length, t, 'left', relay), relay));
		push(t, finish(evaluate(cues, cues.length, t, 'right', relay), relay));
	}
	return points;
}
