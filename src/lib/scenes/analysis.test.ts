import { describe, expect, it } from 'vitest';
import { analyseScene } from './analysis';
import type { Scene } from './types';

const leds = (id: string, supplyId: string, amps: number) => ({
	id,
	name: id,
	kind: 'led' as const,
	currentAtFull: amps,
	safeState: 'full',
	supplyId
});

describe('analyseScene', () => {
	const scene: Scene = {
		lengthMs: 10_000,
		rearmMs: 5_000,
		cues: [
			{ id: 'a', outputId: 'left', startMs: 0, action: { type: 'set', level: 1 } },
			{ id: 'b', outputId: 'right', startMs: 0, action: { type: 'set', level: 1 } }
		]
	};

	it('counts each output against the supply that feeds it, with 80 % derating', () => {
		// common practice, no published source: plan continuous load at 80 % of the rating
		const result = analyseScene(scene, [leds('left', 'A', 2.5), leds('right', 'B', 1)], {
			supplies: [
				{ id: 'A', name: 'Board A', amps: 3 },
				{ id: 'B', name: 'Board B', amps: 3 }
			]
		});
		const supply = result.findings.filter((f) => f.code === 'supply-current');
		expect(supply.map((f) => [f.severity, f.message.split(':')[0]])).toEqual([
			['warning', 'Board A'],
			['info', 'Board B']
		]);
		expect(result.peaks.find((p) => p.supplyId === null)?.amps).toBeCloseTo(3.5, 12);
		expect(result.warnings).toBe(1);
	});

	it('gives the throughput the cycle allows: group x 3600 / max(dispatch, cycle)', () => {
		// ride-capacity arithmetic (reference-values.md, show operations): 6 x 3600 / 15 = 1440
		const result = analyseScene(scene, [leds('left', 'A', 0.1), leds('right', 'A', 0.1)], {
			dispatchIntervalS: 12,
			groupSize: 6
		});
		expect(result.cycleMs).toBe(15_000);
		expect(result.throughputPerHour).toBe(1440);
		expect(result.findings.some((f) => f.code === 'cycle-over-dispatch')).toBe(true);
	});

	it('asks for signage when an LED strobes at 4 Hz but not at 3 Hz (WCAG 2.3.1)', () => {
		const strobe = (rateHz: number): Scene => ({
			lengthMs: 4000,
			rearmMs: 0,
			cues: [
				{
					id: 's',
					outputId: 'left',
					startMs: 0,
					action: { type: 'strobe', rateHz, durationMs: 2000, level: 1 }
				}
			]
		});
		const outputs = [{ ...leds('left', 'A', 0.1), curve: { kind: 'cie' as const } }];
		expect(analyseScene(strobe(4), outputs).needsStrobeSignage).toBe(true);
		expect(analyseScene(strobe(3), outputs).needsStrobeSignage).toBe(false);
	});

	it('gives each relay its share of the cycle beside its duty rating', () => {
		// on time / (timeline + re-arm): 3 s of 10 s + 5 s = 20 % (our definition, checks.ts)
		const fog: Scene = {
			lengthMs: 10_000,
			rearmMs: 5_000,
			cues: [{ id: 'f', outputId: 'fog', startMs: 0, action: { type: 'pulse', durationMs: 3000 } }]
		};
		const relay = {
			id: 'fog',
			name: 'Fog',
			kind: 'relay' as const,
			currentAtFull: 0.07,
			safeState: 'off',
			maxDutyPercent: 15
		};
		const result = analyseScene(fog, [relay]);
		expect(result.relayDuty).toEqual([
			{ outputId: 'fog', name: 'Fog', percent: 20, ratingPercent: 15 }
		]);
		expect(result.findings.some((f) => f.code === 'relay-duty' && f.severity === 'error')).toBe(
			true
		);
	});
});
