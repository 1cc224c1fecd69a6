import { z } from 'zod';
import { num, optNum, text } from './num';

export const capacitiveSettings = z.object({
	kind: z.literal('capacitive'),
	resistanceOhm: num('Resistor', { kind: 'ohms', gt: 0, max: 1e9 }),
	plateAreaCm2: num('Plate area', { gt: 0, max: 1e5 }),
	gapMm: num('Gap', { gt: 0, max: 1000 }),
	strayPf: num('Stray capacitance', { kind: 'farads', scale: 1e-12, min: 0, max: 1e5 }),
	samplesAveraged: num('Readings averaged', { int: true, min: 1, max: 4096 }),
	readingNoiseCounts: num('Noise per reading', { min: 0, max: 1e6 }),
	handFraction: num('Hand fills', { min: 0, max: 1 })
});
export const motionSettings = z.object({
	kind: z.literal('motion'),
	warmUpS: num('Warm-up', { kind: 'seconds', min: 0, max: 600 }),
	rangeM: num('Range', { gt: 0, max: 100 })
});
export const breakBeamSettings = z.object({
	kind: z.literal('break_beam'),
	beamLengthM: num('Beam length', { gt: 0, max: 100 })
});
export const rangingSettings = z.object({
	kind: z.literal('ranging'),
	method: z.enum(['ultrasonic', 'time_of_flight'], { error: 'Choose how it measures.' }),
	airTempC: num('Air temperature', { min: -40, max: 60 }),
	maxRangeM: num('Longest range', { gt: 0, max: 50 })
});
export const pressureMatSettings = z.object({
	kind: z.literal('pressure_mat'),
	zones: num('Zones', { int: true, min: 1, max: 64 })
});
export const buttonSettings = z.object({
	kind: z.literal('button'),
	latching: z.preprocess((v) => v === 'on' || v === 'true' || v === true, z.boolean())
});

/** Each sensor kind with its own fields; used by the forms and the API alike. */
export const sensorSettingsSchema = z.discriminatedUnion(
	'kind',
	[
		capacitiveSettings,
		motionSettings,
		breakBeamSettings,
		rangingSettings,
		pressureMatSettings,
		buttonSettings
	],
	{ error: 'Choose a kind of sensor.' }
);
export type SensorSettings = z.infer<typeof sensorSettingsSchema>;

export const triggerRangeSchema = z
	.object({
		near: optNum('Near end'),
		far: optNum('Far end'),
		hysteresis: optNum('Hysteresis', { min: 0 }),
		debounceMs: num('Debounce', { int: true, min: 0, max: 60000 }),
		rearmMs: num('Re-arm time', { int: true, min: 0, max: 3600000 })
	})
	.refine((r) => r.near === null || r.far === null || r.near !== r.far, {
		message: 'The near and far ends must differ.',
		path: ['near']
	});

export const sensorSchema = z.object({
	name: text('A name'),
	settings: sensorSettingsSchema,
	range: triggerRangeSchema
});
export type SensorInput = z.infer<typeof sensorSchema>;

export { speedOfSound } from '$lib/props/sound';
