import { describe, expect, it } from 'vitest';
import { cueEndMs, cueProblem, levelAt, timelineEndMs, timelinePoints } from './timeline';
import type { Cue, CueAction, Scene } from './types';

let next = 0;
const cue = (outputId: string, startMs: number, action: CueAction): Cue => ({
	id: `c${++next}`,
	outputId,
	startMs,
	action
});
const scene = (cues: Cue[], extra: Partial<Scene> = {}): Scene => ({
	lengthMs: 10_000,
	rearmMs: 5_000,
	cues,
	...extra
});

// Expected levels follow our own cue definitions (see types.ts); no published source.
describe('levelAt', () => {
	it('rests at 0 before any cue and holds a set level', () => {
		const s = scene([cue('a', 1000, { type: 'set', level: 0.4 })]);
		expect(levelAt(s, 'a', 0)).toBe(0);
		expect(levelAt(s, 'a', 999)).toBe(0);
		expect(levelAt(s, 'a', 1000)).toBe(0.4);
		expect(levelAt(s, 'a', 9000)).toBe(0.4);
		expect(levelAt(s, 'other', 9000)).toBe(0);
	});

	it('fades in a straight line from the level at its start', () => {
		const s = scene([
			cue('a', 0, { type: 'set', level: 0.2 }),
			cue('a', 1000, { type: 'fade', level: 1, durationMs: 1000 })
		]);
		expect(levelAt(s, 'a', 1000)).toBeCloseTo(0.2, 12);
		expect(levelAt(s, 'a', 1500)).toBeCloseTo(0.6, 12);
		expect(levelAt(s, 'a', 1750)).toBeCloseTo(0.8, 12);
		expect(levelAt(s, 'a', 2000)).toBe(1);
		expect(levelAt(s, 'a', 5000)).toBe(1);
	});

	it('lets a later cue take over a fade', () => {
		const s = scene([
			cue('a', 0, { type: 'fade', level: 1, durationMs: 1000 }),
			cue('a', 500, { type: 'set', level: 0.2 })
		]);
		expect(levelAt(s, 'a', 400)).toBeCloseTo(0.4, 12);
		expect(levelAt(s, 'a', 700)).toBe(0.2);
	});

	it('hands back to the rest of the timeline after a pulse', () => {
		const s = scene([
			cue('a', 0, { type: 'fade', level: 1, durationMs: 1000 }),
			cue('a', 200, { type: 'pulse', durationMs: 100 })
		]);
		expect(levelAt(s, 'a', 250)).toBe(1);
		expect(levelAt(s, 'a', 400)).toBeCloseTo(0.4, 12);
	});

	it('strobes on at the level for the first half of each period', () => {
		const s = scene([cue('a', 1000, { type: 'strobe', rateHz: 4, durationMs: 1000, level: 0.8 })]);
		expect(levelAt(s, 'a', 1000)).toBe(0.8);
		expect(levelAt(s, 'a', 1124)).toBe(0.8);
		expect(levelAt(s, 'a', 1125)).toBe(0);
		expect(levelAt(s, 'a', 1250)).toBe(0.8);
		expect(levelAt(s, 'a', 1999)).toBe(0);
		expect(levelAt(s, 'a', 2000)).toBe(0);
	});

	it('switches relays: any level above 0 is on, and a fade switches at its end', () => {
		const s = scene([
			cue('valve', 0, { type: 'set', level: 0.3 }),
			cue('valve', 1000, { type: 'fade', level: 0, durationMs: 500 })
		]);
		expect(levelAt(s, 'valve', 100, { kind: 'relay' })).toBe(1);
		expect(levelAt(s, 'valve', 1400, { kind: 'relay' })).toBe(1);
		expect(levelAt(s, 'valve', 1500, { kind: 'relay' })).toBe(0);
		expect(levelAt(s, 'valve', 1250)).toBeCloseTo(0.15, 12);
	});

	it('takes the higher of the timeline and a response', () => {
		const s = scene([cue('a', 0, { type: 'set', level: 0.3 })], {
			responses: [{ id: 'r', sensorId: 'plate', outputId: 'a', minLevel: 0.1, maxLevel: 0.9 }]
		});
		expect(levelAt(s, 'a', 500, { depths: { plate: 0 } })).toBe(0.3);
		expect(levelAt(s, 'a', 500, { depths: { plate: 0.5 } })).toBeCloseTo(0.5, 12);
		expect(levelAt(s, 'a', 500, { depths: { plate: 2 } })).toBeCloseTo(0.9, 12);
		expect(levelAt(s, 'a', 500)).toBe(0.3);
	});

	it('skips cues that cannot run', () => {
		const s = scene([cue('a', 0, { type: 'set', level: 2 })]);
		expect(levelAt(s, 'a', 100)).toBe(0);
	});
});

describe('timelinePoints', () => {
	it('marks each strobe edge with the level before and after', () => {
		const s = scene([cue('a', 0, { type: 'strobe', rateHz: 2, durationMs: 1000, level: 1 })], {
			lengthMs: 1500
		});
		expect(timelinePoints(s, 'a')).toEqual([
			{ tMs: 0, level: 0 },
			{ tMs: 0, level: 1 },
			{ tMs: 250, level: 1 },
			{ tMs: 250, level: 0 },
			{ tMs: 500, level: 0 },
			{ tMs: 500, level: 1 },
			{ tMs: 750, level: 1 },
			{ tMs: 750, level: 0 },
			{ tMs: 1000, level: 0 },
			{ tMs: 1500, level: 0 }
		]);
	});

	it('joins a fade with a straight line', () => {
		const s = scene([cue('a', 200, { type: 'fade', level: 0.5, durationMs: 800 })], {
			lengthMs: 1000
		});
		expect(timelinePoints(s, 'a')).toEqual([
			{ tMs: 0, level: 0 },
			{ tMs: 200, level: 0 },
			{ tMs: 1000, level: 0.5 }
		]);
	});
});

describe('cue helpers', () => {
	it('knows where cues end and where the timeline stops', () => {
		const fade = cue('a', 9000, { type: 'fade', level: 1, durationMs: 2000 });
		expect(cueEndMs(fade)).toBe(11_000);
		expect(cueEndMs(cue('a', 3000, { type: 'set', level: 1 }))).toBe(3000);
		expect(timelineEndMs(scene([fade]))).toBe(11_000);
	});

	it('explains cues that cannot run', () => {
		expect(cueProblem(cue('a', -1, { type: 'set', level: 1 }))).toMatch(/start/);
		expect(cueProblem(cue('a', 0, { type: 'pulse', durationMs: 0 }))).toMatch(/length/);
		expect(
			cueProblem(cue('a', 0, { type: 'strobe', rateHz: 0, durationMs: 10, level: 1 }))
		).toMatch(/rate/);
		expect(cueProblem(cue('a', 0, { type: 'fade', level: 1, durationMs: 0 }))).toBeNull();
	});
});
