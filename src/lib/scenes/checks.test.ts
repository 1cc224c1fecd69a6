import { describe, expect, it } from 'vitest';
import {
	checkScene,
	cycleMs,
	findCueOverlaps,
	flashTransitions,
	maxFlashesPerSecond,
	needsStrobeSignage,
	peakCurrent,
	ruleContext,
	SCENE_RULES,
	throughputPerHour,
	type SceneCheckOptions
} from './checks';
import { timelinePoints } from './timeline';
import type { Cue, CueAction, Finding, FindingCode, Output, Scene } from './types';

let next = 0;
const cue = (outputId: string, startMs: number, action: CueAction, id = `c${++next}`): Cue => ({
	id,
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
const led = (id: string, currentAtFull = 1, extra: Partial<Output> = {}): Output => ({
	id,
	name: `LEDs ${id}`,
	kind: 'led',
	currentAtFull,
	safeState: 'full',
	...extra
});
const relay = (id: string, extra: Partial<Output> = {}): Output => ({
	id,
	name: `Relay ${id}`,
	kind: 'relay',
	relayKind: 'pneumatic',
	currentAtFull: 0.1,
	safeState: 'de-energised',
	...extra
});
const codes = (findings: Finding[], code: FindingCode) => findings.filter((f) => f.code === code);
const strobe = (rateHz: number, durationMs = 3000, level = 1): CueAction => ({
	type: 'strobe',
	rateHz,
	durationMs,
	level
});

describe('flash rate (WCAG 2.x SC 2.3.1)', () => {
	// WCAG 2.x SC 2.3.1 and its "general flash" definition: a flash is a pair of opposing changes of
	// at least 10 % of maximum relative luminance with the darker state below 0.80; more than three
	// flashes in any one-second period fails.
	it('flags a 4 Hz strobe and says signage is needed', () => {
		const findings = checkScene(scene([cue('a', 1000, strobe(4), 'strobe-cue')]), [led('a')]);
		const [flash] = codes(findings, 'flash-rate');
		expect(flash.severity).toBe('warning');
		expect(flash.message).toMatch(/flashes 4 times in one second/);
		expect(flash.message).toMatch(/signage/);
		expect(flash.cueIds).toEqual(['strobe-cue']);
		expect(flash.outputIds).toEqual(['a']);
		expect(needsStrobeSignage(findings)).toBe(true);
	});

	it('lets a 3 Hz strobe through', () => {
		const findings = checkScene(scene([cue('a', 1000, strobe(3))]), [led('a')]);
		expect(codes(findings, 'flash-rate')).toEqual([]);
		expect(needsStrobeSignage(findings)).toBe(false);
	});

	it('counts two transitions per flash: a 4 Hz strobe has 8 in a second, 3 Hz has 6', () => {
		const at4 = timelinePoints(scene([cue('a', 0, strobe(4))]), 'a');
		const at3 = timelinePoints(scene([cue('a', 0, strobe(3))]), 'a');
		expect(flashTransitions(at4).slice(0, 9)).toEqual([0, 125, 250, 375, 500, 625, 750, 875, 1000]);
		expect(maxFlashesPerSecond(at4).flashes).toBe(4);
		expect(maxFlashesPerSecond(at3).flashes).toBe(3);
	});

	it('does not count a slow fade up and down', () => {
		const cues = [0, 4000, 8000].flatMap((t) => [
			cue('a', t, { type: 'fade', level: 1, durationMs: 2000 }),
			cue('a', t + 2000, { type: 'fade', level: 0, durationMs: 2000 })
		]);
		const s = scene(cues, { lengthMs: 12_000 });
		expect(maxFlashesPerSecond(timelinePoints(s, 'a')).flashes).toBe(0.5);
		expect(codes(checkScene(s, [led('a')]), 'flash-rate')).toEqual([]);
	});

	it('counts fast fades, not only jumps', () => {
		const cues = Array.from({ length: 10 }, (_, i) =>
			cue('a', i * 100, { type: 'fade', level: i % 2 === 0 ? 1 : 0, durationMs: 100 })
		);
		const findings = checkScene(scene(cues), [led('a')]);
		expect(codes(findings, 'flash-rate')[0].message).toMatch(/flashes 5 times/);
	});

	it('ignores changes smaller than 10 % and flicker whose darker state is 0.80 or brighter', () => {
		const alternate = (low: number, high: number) =>
			Array.from({ length: 20 }, (_, i) =>
				cue('a', i * 50, { type: 'set', level: i % 2 === 0 ? high : low })
			);
		expect(codes(checkScene(scene(alternate(0.5, 0.55)), [led('a')]), 'flash-rate')).toEqual([]);
		expect(codes(checkScene(scene(alternate(0.85, 1)), [led('a')]), 'flash-rate')).toEqual([]);
		expect(codes(checkScene(scene(alternate(0.7, 1)), [led('a')]), 'flash-rate')).toHaveLength(1);
	});

	it('judges relative luminance after the brightness curve', () => {
		// Gamma 2.2 (common practice for LED dimming): level 0.9 gives 0.9^2.2 = 0.793 luminance, below
		// 0.80, so 0.9 <-> 1.0 flicker becomes a flash once the curve is applied.
		const flicker = Array.from({ length: 20 }, (_, i) =>
			cue('a', i * 50, { type: 'set', level: i % 2 === 0 ? 1 : 0.9 })
		);
		const s = scene(flicker);
		expect(codes(checkScene(s, [led('a')]), 'flash-rate')).toEqual([]);
		const gamma = { luminance: (_: Output, level: number) => level ** 2.2 };
		expect(codes(checkScene(s, [led('a')], gamma), 'flash-rate')).toHaveLength(1);
	});

	it('asks for signage wherever a relay switches a strobe light', () => {
		const findings = checkScene(scene([cue('s', 0, { type: 'pulse', durationMs: 2000 })]), [
			relay('s', { relayKind: 'strobe' })
		]);
		expect(codes(findings, 'strobe-light')).toHaveLength(1);
		expect(needsStrobeSignage(findings)).toBe(true);
	});
});

describe('flash rate of a room seen together (WCAG 2.x SC 2.3.1)', () => {
	// WCAG 2.3.1 counts the flashes a viewer sees in any one second; every light of a scene is in
	// the same room, so their flash transitions are pooled, and changes at the same moment count once.
	it('counts two 2 Hz strobes out of step as 4 flashes a second together', () => {
		// each alone: 2 Hz = 4 transitions a second = 2 flashes, under the limit of 3
		const findings = checkScene(scene([cue('a', 1000, strobe(2)), cue('b', 1125, strobe(2))]), [
			led('a'),
			led('b')
		]);
		const flash = codes(findings, 'flash-rate');
		expect(flash).toHaveLength(1);
		expect(flash[0].message).toMatch(
			/^Together, 'LEDs a' and 'LEDs b' flash 4 times in one second/
		);
		expect(flash[0].outputIds).toEqual(['a', 'b']);
		expect(needsStrobeSignage(findings)).toBe(true);
	});

	it('counts lights that change at the same moment as one', () => {
		// the same 2 Hz in step: the viewer sees 2 flashes a second
		const findings = checkScene(scene([cue('a', 1000, strobe(2)), cue('b', 1000, strobe(2))]), [
			led('a'),
			led('b')
		]);
		expect(codes(findings, 'flash-rate')).toEqual([]);
	});

	it('pools a strobe relay with the LEDs', () => {
		// a 2 Hz LED strobe (2 flashes a second) and a strobe light pulsed twice a second between
		// its changes (2 flashes): 4 together
		const pulses = [0, 1].map((k) =>
			cue('s', 1062.5 + k * 500, { type: 'pulse', durationMs: 100 })
		);
		const findings = checkScene(scene([cue('a', 1000, strobe(2)), ...pulses]), [
			led('a'),
			relay('s', { relayKind: 'strobe' })
		]);
		const flash = codes(findings, 'flash-rate');
		expect(flash).toHaveLength(1);
		expect(flash[0].message).toMatch(/flash 4 times in one second/);
		expect(flash[0].outputIds).toEqual(['a', 's']);
	});

	it('warns that a light jumping at a sensor depth can flicker as fast as the reading wavers', () => {
		const response = (extra: Record<string, unknown>) => ({
			id: 'r',
			sensorId: 'hand',
			outputId: 'a',
			...extra
		});
		const check = (extra: Record<string, unknown>) =>
			codes(checkScene(scene([], { responses: [response(extra)] }), [led('a')]), 'flash-rate');
		const step = check({ shape: 'step', threshold: 0.6, minLevel: 0.15, maxLevel: 1 });
		expect(step[0].message).toMatch(
			/^'LEDs a' jumps between 15 % and 100 % when the sensor reads 60 % deep: a guest lingering/
		);
		// a drawn line rising 0.1 to 0.9 across 2 % of depth is a jump too
		const steep = check({
			shape: 'points',
			points: [
				[0, 0.1],
				[0.5, 0.1],
				[0.52, 0.9],
				[1, 1]
			]
		});
		expect(steep).toHaveLength(1);
		// a gradual rise follows the hand, and a jump under 10 % of full, or whose darker state is
		// 0.80 or brighter, is no flash (WCAG 2.x general flash definition)
		expect(check({ shape: 'rise', minLevel: 0, maxLevel: 1 })).toEqual([]);
		expect(check({ shape: 'step', minLevel: 0.3, maxLevel: 0.35 })).toEqual([]);
		expect(check({ shape: 'step', minLevel: 0.8, maxLevel: 1 })).toEqual([]);
	});
});

describe('overlapping cues on one output', () => {
	// Our own rule, no published source: two cues on one output may not act at the same moment.
	it('flags a set inside a fade and two cues at the same moment', () => {
		const s = scene([
			cue('a', 0, { type: 'fade', level: 1, durationMs: 1000 }, 'fade'),
			cue('a', 500, { type: 'set', level: 0 }, 'inside'),
			cue('a', 3000, { type: 'set', level: 1 }, 'same1'),
			cue('a', 3000, { type: 'pulse', durationMs: 100 }, 'same2')
		]);
		expect(findCueOverlaps(s).map((o) => [o.first.id, o.second.id])).toEqual([
			['fade', 'inside'],
			['same1', 'same2']
		]);
		const [first] = codes(checkScene(s, [led('a')]), 'cue-overlap');
		expect(first.message).toBe(
			"The fade at 0 s and the set at 0.5 s on 'LEDs a' overlap; the later cue takes over."
		);
		expect(first.cueIds).toEqual(['fade', 'inside']);
	});

	it('lets a cue start as the previous one ends, and cues on other outputs run together', () => {
		const s = scene([
			cue('a', 0, { type: 'fade', level: 1, durationMs: 1000 }),
			cue('a', 1000, { type: 'pulse', durationMs: 500 }),
			cue('b', 200, { type: 'strobe', rateHz: 2, durationMs: 1000, level: 1 })
		]);
		expect(findCueOverlaps(s)).toEqual([]);
	});
});

describe('peak supply current', () => {
	// Sum of currentAtFull x level for LED strings plus relays that are on; usable supply is 80 % of
	// its rating (common practice, no published source).
	const outputs = [led('a', 1), led('b', 1), led('c', 1), relay('v', { currentAtFull: 0.5 })];
	const together = scene([
		cue('a', 0, { type: 'set', level: 1 }),
		cue('b', 0, { type: 'fade', level: 1, durationMs: 2000 }),
		cue('c', 1000, { type: 'set', level: 0.5 }),
		cue('c', 3000, { type: 'set', level: 0 }),
		cue('v', 2000, { type: 'pulse', durationMs: 500 })
	]);

	it('finds the moment of the highest total', () => {
		// At 2.0 s: a 1 A + b 1 A (fade done) + c 0.5 x 1 A + valve 0.5 A = 3.0 A.
		expect(peakCurrent(together, outputs)).toEqual({
			amps: 3,
			atMs: 2000,
			outputIds: ['a', 'b', 'c', 'v']
		});
	});

	it('is an error above the rating, a warning above 80 % of it, otherwise information', () => {
		const supply = (supplyAmps: number) =>
			codes(checkScene(together, outputs, { supplyAmps }), 'supply-current')[0];
		expect(supply(2.9).severity).toBe('error');
		// 3.0 A against 3.6 A: above the 2.88 A usable (80 % of 3.6 A) but within the rating.
		expect(supply(3.6).severity).toBe('warning');
		expect(supply(3.6).message).toMatch(/above 2\.88 A, 80 % of the supply's 3\.6 A rating/);
		// 3.0 A against 3.75 A: exactly the 3.0 A usable.
		expect(supply(3.75).severity).toBe('info');
		expect(supply(5).message).toMatch(/^Peak current 3 A at 2 s, within 4 A/);
	});

	it('counts a response at its highest level, since a guest can drive it there', () => {
		const s = scene([cue('a', 0, { type: 'set', level: 0.2 })], {
			responses: [{ id: 'r', sensorId: 'plate', outputId: 'b', maxLevel: 0.75 }]
		});
		expect(peakCurrent(s, outputs).amps).toBeCloseTo(0.95, 12);
	});

	it('staggering cues lowers the peak', () => {
		const staggered = scene([
			cue('a', 0, { type: 'pulse', durationMs: 1000 }),
			cue('b', 1000, { type: 'pulse', durationMs: 1000 }),
			cue('c', 2000, { type: 'pulse', durationMs: 1000 })
		]);
		expect(peakCurrent(staggered, outputs).amps).toBe(1);
	});
});

describe('safe state', () => {
	// Life-safety practice (NFPA 101 / IBC 411 special amusement provisions): effects stop on alarm,
	// so every output used needs a safe state.
	it('is an error for an output used without one, and silent for unused outputs', () => {
		const outputs = [
			led('a', 1, { safeState: null }),
			led('b', 1, { safeState: ' ' }),
			led('c', 1, { safeState: undefined })
		];
		const s = scene([cue('a', 0, { type: 'set', level: 1 })], {
			responses: [{ id: 'r', sensorId: 'beam', outputId: 'b' }]
		});
		const missing = codes(checkScene(s, outputs), 'safe-state-missing');
		expect(missing.map((f) => f.outputIds[0])).toEqual(['a', 'b']);
		expect(missing.every((f) => f.severity === 'error')).toBe(true);
	});
});

describe('cycle and throughput', () => {
	// Ride-capacity arithmetic: group x 3600 / interval, where a cycle longer than the dispatch
	// interval becomes the limit.
	it('computes guests per hour', () => {
		expect(throughputPerHour(6, 60)).toBe(360);
		expect(throughputPerHour(6, 60, 45)).toBe(360);
		expect(throughputPerHour(6, 60, 90)).toBe(240);
		expect(() => throughputPerHour(0, 60)).toThrow(RangeError);
	});

	it('warns when length plus re-arm is longer than the dispatch interval', () => {
		const s = scene([], { lengthMs: 45_000, rearmMs: 20_000 });
		expect(cycleMs(s)).toBe(65_000);
		const findings = checkScene(s, [], { dispatchIntervalS: 60, groupSize: 6 });
		const [slow] = codes(findings, 'cycle-over-dispatch');
		expect(slow.severity).toBe('warning');
		// 6 x 3600 / 65 = 332.3, against 6 x 3600 / 60 = 360.
		expect(slow.message).toMatch(/65 s\) is longer than the 60 s dispatch interval/);
		expect(slow.message).toMatch(/332 guests per hour instead of 360/);
		expect(codes(findings, 'throughput')[0].message).toBe(
			'332 guests per hour (groups of 6 every 65 s).'
		);
	});

	it('stays quiet when the cycle fits the dispatch interval', () => {
		const s = scene([], { lengthMs: 30_000, rearmMs: 10_000 });
		const findings = checkScene(s, [], { dispatchIntervalS: 60, groupSize: 8 });
		expect(codes(findings, 'cycle-over-dispatch')).toEqual([]);
		expect(codes(findings, 'throughput')[0].message).toBe(
			'480 guests per hour (groups of 8 every 60 s).'
		);
	});
});

describe('relay ratings', () => {
	// Compared against the part's own minimum on/off times and duty rating, entered from its datasheet.
	it('flags on and off times below the minimum', () => {
		const valve = relay('v', { minOnMs: 100, minOffMs: 200 });
		const s = scene(
			[
				cue('v', 1000, { type: 'pulse', durationMs: 50 }, 'short-on'),
				cue('v', 1150, { type: 'pulse', durationMs: 300 }, 'after'),
				cue('v', 3000, { type: 'pulse', durationMs: 300 }, 'fine')
			],
			{ lengthMs: 5000, rearmMs: 0 }
		);
		const findings = checkScene(s, [valve]);
		const [on] = codes(findings, 'relay-min-on');
		expect(on.message).toBe(
			"'Relay v' is on for as little as 0.05 s (1 time), under its 0.1 s minimum on time."
		);
		expect(on.cueIds).toEqual(['short-on']);
		const [off] = codes(findings, 'relay-min-off');
		expect(off.message).toMatch(/off for as little as 0\.1 s, under its 0\.2 s minimum off time/);
		expect(off.cueIds).toEqual(['short-on', 'after']);
	});

	it('counts the gap into the next run of the scene', () => {
		const valve = relay('v', { minOffMs: 2000 });
		const s = scene(
			[
				cue('v', 500, { type: 'pulse', durationMs: 1000 }),
				cue('v', 3000, { type: 'pulse', durationMs: 1000 })
			],
			{ lengthMs: 4500, rearmMs: 500 }
		);
		// Off 4.0 s -> 4.5 s end, 0.5 s re-arm, then 0.5 s before the first pulse: 1.5 s.
		expect(codes(checkScene(s, [valve]), 'relay-min-off')[0].message).toMatch(
			/as little as 1\.5 s \(counting the gap into the next run/
		);
	});

	it('flags a relay strobed faster than it can switch', () => {
		const valve = relay('v', { minOnMs: 100, minOffMs: 100 });
		const findings = checkScene(scene([cue('v', 0, strobe(10, 1000))]), [valve]);
		expect(codes(findings, 'relay-min-on')[0].message).toMatch(/0\.05 s \(10 times\)/);
		expect(codes(findings, 'relay-min-off')).toHaveLength(1);
	});

	it('flags duty above the rating over a whole cycle', () => {
		// On 3 s of a 10 s length + 5 s re-arm = 20 %.
		const s = scene([cue('v', 0, { type: 'pulse', durationMs: 3000 })]);
		expect(codes(checkScene(s, [relay('v', { maxDutyPercent: 25 })]), 'relay-duty')).toEqual([]);
		expect(
			codes(checkScene(s, [relay('v', { maxDutyPercent: 15 })]), 'relay-duty')[0].message
		).toBe("'Relay v' is on 20 % of each cycle, above its 15 % duty rating.");
	});

	it('warns about a relay left on at the end, and about fading a relay', () => {
		const s = scene([cue('v', 9000, { type: 'fade', level: 1, durationMs: 500 })]);
		const findings = checkScene(s, [relay('v')]);
		expect(codes(findings, 'relay-on-at-end')).toHaveLength(1);
		expect(codes(findings, 'relay-fade')).toHaveLength(1);
	});
});

describe('checkScene housekeeping', () => {
	// Our own rules; no published source.
	it('reports cues that cannot run, unknown outputs and cues past the end, errors first', () => {
		const findings = checkScene(
			scene([
				cue('a', 9500, { type: 'fade', level: 1, durationMs: 1000 }, 'late'),
				cue('ghost', 0, { type: 'set', level: 1 }, 'ghost-cue'),
				cue('a', 0, { type: 'set', level: 1.5 }, 'too-bright')
			]),
			[led('a')]
		);
		expect(findings.map((f) => [f.code, f.severity])).toEqual([
			['unknown-output', 'error'],
			['cue-invalid', 'error'],
			['cue-past-end', 'warning'],
			['supply-current', 'info']
		]);
		expect(findings[1].message).toBe(
			"A cue on 'LEDs a' cannot run: its level must be between 0 and 1."
		);
		expect(findings[2].message).toBe(
			"The fade at 9.5 s on 'LEDs a' runs to 10.5 s, past the scene's 10 s length."
		);
	});

	it('stops at a scene with no length', () => {
		expect(checkScene(scene([], { lengthMs: 0 }), []).map((f) => f.code)).toEqual([
			'scene-invalid'
		]);
	});
});

describe('each rule alone', () => {
	type Case = { scene: Scene; outputs: Output[]; options?: SceneCheckOptions; code: FindingCode };
	const pulse = (outputId: string, startMs: number): Cue =>
		cue(outputId, startMs, { type: 'pulse', durationMs: 100 });
	const cases: Record<string, Case> = {
		'scene times': { scene: scene([], { lengthMs: 0 }), outputs: [], code: 'scene-invalid' },
		cues: {
			scene: scene([cue('gone', 0, { type: 'set', level: 1 })]),
			outputs: [],
			code: 'unknown-output'
		},
		'response outputs': {
			scene: scene([], { responses: [{ id: 'r', sensorId: 's', outputId: 'gone' }] }),
			outputs: [],
			code: 'unknown-output'
		},
		'cue overlaps': {
			scene: scene([
				cue('a', 1000, { type: 'set', level: 1 }),
				cue('a', 1000, { type: 'set', level: 0 })
			]),
			outputs: [led('a')],
			code: 'cue-overlap'
		},
		'safe states': {
			scene: scene([cue('a', 0, { type: 'set', level: 1 })]),
			outputs: [led('a', 1, { safeState: ' ' })],
			code: 'safe-state-missing'
		},
		'lamp flashes': {
			scene: scene([cue('a', 1000, strobe(4))]),
			outputs: [led('a')],
			code: 'flash-rate'
		},
		'room flashes': {
			scene: scene([cue('a', 1000, strobe(2)), cue('b', 1125, strobe(2))]),
			outputs: [led('a'), led('b')],
			code: 'flash-rate'
		},
		'response flicker': {
			scene: scene([], {
				responses: [
					{ id: 'r', sensorId: 's', outputId: 'a', shape: 'step', threshold: 0.6, minLevel: 0.15 }
				]
			}),
			outputs: [led('a')],
			code: 'flash-rate'
		},
		'strobe lights': {
			scene: scene([pulse('s', 1000)]),
			outputs: [relay('s', { relayKind: 'strobe' })],
			code: 'strobe-light'
		},
		'supply current': {
			scene: scene([cue('a', 0, { type: 'set', level: 1 })]),
			outputs: [led('a', 2)],
			options: { supplyAmps: 1 },
			code: 'supply-current'
		},
		'cycle over dispatch': {
			scene: scene([]),
			outputs: [],
			options: { dispatchIntervalS: 10 },
			code: 'cycle-over-dispatch'
		},
		throughput: { scene: scene([]), outputs: [], options: { groupSize: 6 }, code: 'throughput' },
		'relay timing': {
			scene: scene([pulse('v', 1000)]),
			outputs: [relay('v', { minOnMs: 500 })],
			code: 'relay-min-on'
		}
	};

	it('has a case for every rule', () => {
		expect(Object.keys(cases).sort()).toEqual(SCENE_RULES.map((r) => r.name).sort());
	});

	it.each(SCENE_RULES.map((rule) => [rule.name, rule] as const))(
		'%s finds its case, and checkScene finds the same',
		(name, rule) => {
			const c = cases[name];
			const alone = rule.check(ruleContext(c.scene, c.outputs, c.options));
			expect(alone.map((f) => f.code)).toContain(c.code);
			expect(checkScene(c.scene, c.outputs, c.options)).toEqual(expect.arrayContaining(alone));
		}
	);
});
