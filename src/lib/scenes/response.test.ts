import { describe, expect, it } from 'vitest';
import { responseLevel, responseMaxLevel } from './response';
import { levelAt } from './timeline';
import type { Response, Scene } from './types';

const response = (extra: Partial<Response>): Response => ({
	id: 'r',
	sensorId: 'plate',
	outputId: 'leds',
	...extra
});

// Expected levels follow our own response definitions (types.ts); no published source.
describe('responseLevel', () => {
	it('rises in a straight line from the low level at depth 0 to the high level at depth 1', () => {
		const r = response({ shape: 'rise', minLevel: 0.2, maxLevel: 0.8 });
		expect(responseLevel(r, 0)).toBeCloseTo(0.2, 12);
		expect(responseLevel(r, 0.5)).toBeCloseTo(0.5, 12);
		expect(responseLevel(r, 1)).toBeCloseTo(0.8, 12);
		expect(responseLevel(r, 3)).toBeCloseTo(0.8, 12);
		expect(responseLevel(r, -1)).toBeCloseTo(0.2, 12);
	});

	it('rises from 0 to 1 when no levels are given', () => {
		expect(responseLevel(response({}), 0.25)).toBeCloseTo(0.25, 12);
	});

	it('falls from the high level to the low level', () => {
		const r = response({ shape: 'fall', minLevel: 0, maxLevel: 1 });
		expect(responseLevel(r, 0)).toBe(1);
		expect(responseLevel(r, 0.75)).toBeCloseTo(0.25, 12);
		expect(responseLevel(r, 1)).toBe(0);
	});

	it('steps at the threshold, switching on at the threshold itself', () => {
		const r = response({ shape: 'step', threshold: 0.6, minLevel: 0.1, maxLevel: 0.9 });
		expect(responseLevel(r, 0.59)).toBe(0.1);
		expect(responseLevel(r, 0.6)).toBe(0.9);
		expect(responseLevel(r, 1)).toBe(0.9);
		expect(responseLevel(response({ shape: 'step' }), 0.49)).toBe(0);
		expect(responseLevel(response({ shape: 'step' }), 0.5)).toBe(1);
	});

	it('joins drawn points with straight lines and holds the end levels', () => {
		const r = response({
			shape: 'points',
			points: [
				[0.8, 0.2],
				[0.2, 0],
				[0.5, 1]
			]
		});
		expect(responseLevel(r, 0)).toBe(0);
		expect(responseLevel(r, 0.35)).toBeCloseTo(0.5, 12);
		expect(responseLevel(r, 0.5)).toBe(1);
		expect(responseLevel(r, 0.65)).toBeCloseTo(0.6, 12);
		expect(responseLevel(r, 1)).toBeCloseTo(0.2, 12);
		expect(responseMaxLevel(r)).toBe(1);
	});

	it('gives the low level when no points are drawn', () => {
		expect(responseLevel(response({ shape: 'points', points: [], minLevel: 0.3 }), 0.7)).toBe(0.3);
	});

	it('drives levelAt, where the higher of timeline and response wins', () => {
		const scene: Scene = {
			lengthMs: 1000,
			rearmMs: 0,
			cues: [{ id: 'c', outputId: 'leds', startMs: 0, action: { type: 'set', level: 0.4 } }],
			responses: [response({ shape: 'fall' })]
		};
		expect(levelAt(scene, 'leds', 100, { depths: { plate: 0.1 } })).toBeCloseTo(0.9, 12);
		expect(levelAt(scene, 'leds', 100, { depths: { plate: 0.9 } })).toBeCloseTo(0.4, 12);
	});
});
