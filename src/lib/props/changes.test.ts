import { describe, expect, it } from 'vitest';
import { curveDifferences, outputDifferences, sensorDifferences, summarise } from './changes';

const plate = {
	name: 'Plate',
	kind: 'capacitive' as const,
	settings: { resistanceOhm: 1e6, gapMm: 20, samplesAveraged: 8 },
	near: 830,
	far: 904.7208333333328,
	hysteresis: null,
	debounceMs: 30,
	rearmMs: 2000
};

describe('what a change to a prop says', () => {
	it('names each changed field with its label, rounded figure and unit', () => {
		const diffs = sensorDifferences(plate, {
			...plate,
			settings: { ...plate.settings, resistanceOhm: 4.7e6, gapMm: 20 },
			far: 910,
			hysteresis: 7.5
		});
		expect(summarise(diffs)).toBe(
			'Discharge resistor 1 MΩ → 4.7 MΩ; Far end 904.7 → 910; Hysteresis not set → 7.5'
		);
	});

	it('says nothing when nothing changed, and reads choices by their words', () => {
		expect(sensorDifferences(plate, { ...plate, settings: { ...plate.settings } })).toEqual([]);
		const button = { ...plate, kind: 'button' as const, settings: { latching: false } };
		expect(summarise(sensorDifferences(button, { ...button, settings: { latching: true } }))).toBe(
			'Latching Momentary → Latching'
		);
	});

	it('covers outputs and curves', () => {
		const glow = {
			name: 'Glow',
			kind: 'led_string' as const,
			safeState: 'full' as const,
			settings: { currentMa: 20, colour: 'white' }
		};
		expect(
			summarise(
				outputDifferences(glow, {
					...glow,
					safeState: 'off',
					settings: { currentMa: 15, colour: 'white' }
				})
			)
		).toMatch(/^Safe state .+ → .+; Current per string 20 mA → 15 mA$/);
		expect(curveDifferences({ kind: 'cie' }, { kind: 'cie' })).toEqual([]);
		expect(summarise(curveDifferences({ kind: 'cie' }, { kind: 'gamma', exponent: 2.2 }))).toBe(
			'Brightness curve CIE lightness → gamma 2.2'
		);
	});
});
