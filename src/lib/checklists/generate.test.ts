import { describe, expect, it } from 'vitest';
import { generateChecklist, type GenInput } from './generate';

const band = {
	direction: 'up' as const,
	enter: 510,
	exit: 505,
	baselineLow: 495,
	baselineHigh: 505
};

const input: GenInput = {
	rooms: [
		{ id: 'r-walk', name: 'Lantern Walk', position: 2 },
		{ id: 'r-barn', name: 'Hollow Barn', position: 3 },
		{ id: 'r-orch', name: 'Bone Orchard', position: 4 }
	],
	props: [
		{ id: 'p-drop', name: 'Barn-loft drop', roomId: 'r-barn' },
		{ id: 'p-well', name: 'Hand in the well', roomId: 'r-walk' },
		{ id: 'p-mist', name: 'Orchard mist', roomId: 'r-orch' }
	],
	sensors: [
		{ id: 's-plate', propId: 'p-well', name: 'Plate', kind: 'capacitive', calibration: band },
		{ id: 's-beam', propId: 'p-drop', name: 'Beam', kind: 'break_beam', calibration: null },
		{ id: 's-pir', propId: 'p-mist', name: 'PIR', kind: 'ranging', calibration: null }
	],
	outputs: [
		{
			id: 'o-led',
			propId: 'p-well',
			name: 'Lanterns',
			kind: 'led_string',
			relayKind: null,
			safeState: 'full'
		},
		{
			id: 'o-valve',
			propId: 'p-drop',
			name: 'Valve',
			kind: 'relay',
			relayKind: 'pneumatic',
			safeState: 'de_energised'
		},
		{
			id: 'o-fog',
			propId: 'p-mist',
			name: 'Fog',
			kind: 'relay',
			relayKind: 'fog',
			safeState: 'off'
		}
	],
	strobeSceneRooms: [],
	venueItems: [
		{ id: 'v1', label: 'Exits lit and clear' },
		{ id: 'v2', label: 'First-aid kit stocked' }
	]
};

describe('generateChecklist', () => {
	it('makes a test per sensor and output, the props safety items and the venue list', () => {
		const keys = generateChecklist(input).map((c) => c.key);
		// design item 8: venue items and the show stop first, then rooms in their order
		expect(keys).toEqual([
			'venue:v1',
			'venue:v2',
			'safety:show-stop',
			'sensor:s-plate',
			'output:o-led',
			'sensor:s-beam',
			'output:o-valve',
			'safety:pinch-guards:p-drop',
			'safety:air-bled:p-drop',
			'sensor:s-pir',
			'output:o-fog',
			'safety:fog-detectors:p-mist',
			'safety:fog-fluid:p-mist'
		]);
	});

	it('reads a calibrated sensor against its band and walk-tests the rest, saying why', () => {
		const byKey = new Map(generateChecklist(input).map((c) => [c.key, c]));
		expect(byKey.get('sensor:s-plate')!.expected).toEqual({ mode: 'reading', band });
		const beam = byKey.get('sensor:s-beam')!.expected;
		expect(beam.mode).toBe('walk');
		expect(beam.mode === 'walk' && beam.why).toContain('gives no reading');
		const pir = byKey.get('sensor:s-pir')!.expected;
		expect(pir.mode === 'walk' && pir.why).toContain('No calibration');
	});

	it('puts prop checks in the prop room and venue items in no room', () => {
		const byKey = new Map(generateChecklist(input).map((c) => [c.key, c]));
		expect(byKey.get('output:o-valve')!.roomId).toBe('r-barn');
		expect(byKey.get('venue:v1')!.roomId).toBeNull();
		expect(byKey.get('output:o-led')!.detail).toContain('lights to full');
	});

	it('asks for strobe signage once per room, from a strobe relay or a flashing scene', () => {
		const strobe = {
			...input,
			outputs: [
				...input.outputs,
				{
					id: 'o-strobe',
					propId: 'p-mist',
					name: 'Strobe',
					kind: 'relay' as const,
					relayKind: 'strobe',
					safeState: 'off'
				}
			],
			// WCAG 2.3.1: a scene over 3 flashes per second in the same room, and one in the walk
			strobeSceneRooms: ['r-orch', 'r-walk']
		};
		const signage = generateChecklist(strobe).filter((c) => c.key.includes('strobe-signage'));
		expect(signage.map((c) => c.key)).toEqual([
			'safety:strobe-signage:r-walk',
			'safety:strobe-signage:r-orch'
		]);
		expect(signage[1].label).toBe('Strobe warning signage posted before Bone Orchard');
	});

	it('keeps keys stable when a scene is added, so recorded results stay with their check', () => {
		const before = generateChecklist({ ...input, props: input.props.slice(1) });
		const after = generateChecklist(input);
		const afterKeys = new Set(after.map((c) => c.key));
		expect(before.every((c) => afterKeys.has(c.key))).toBe(true);
		expect(after.length).toBeGreaterThan(before.length);
	});

	it('still has the show-stop item on a night without scenes', () => {
		const none = generateChecklist({ ...input, props: [], venueItems: [] });
		expect(none.map((c) => c.key)).toEqual(['safety:show-stop']);
	});
});
