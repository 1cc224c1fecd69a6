import { z } from 'zod';
import { num, optNum, text } from './num';
import { RELAY_KINDS, SAFE_STATES } from './prop-words';

const LED_COLOUR_VALUES = [
	'red',
	'orange',
	'amber',
	'yellow-green',
	'green',
	'blue',
	'white',
	'infrared'
] as const;

export const ledStringSettings = z.object({
	kind: z.literal('led_string'),
	colour: z.enum(LED_COLOUR_VALUES, { error: 'Choose a colour.' }),
	forwardV: num('Forward voltage', { kind: 'volts', gt: 0, max: 10 }),
	ledsInSeries: num('LEDs in series', { int: true, min: 1, max: 100 }),
	strings: num('Strings in parallel', { int: true, min: 1, max: 1000 }),
	currentMa: num('Current per string', { kind: 'amps', scale: 1e-3, gt: 0, max: 5000 }),
	supplyV: num('String supply', { kind: 'volts', gt: 0, max: 60 }),
	switchDropV: num('Switch drop', { kind: 'volts', min: 0, max: 10 }),
	logicHighV: num('Logic high', { kind: 'volts', gt: 0, max: 20 }),
	gateThresholdMaxV: num('Gate threshold (max)', { kind: 'volts', gt: 0, max: 20 }),
	continuousDrainMa: num('Switch drain rating', { kind: 'amps', scale: 1e-3, gt: 0, max: 1e6 })
});

export const relaySettings = z.object({
	kind: z.literal('relay'),
	relayKind: z.enum(RELAY_KINDS, { error: 'Choose what the relay drives.' }),
	coilV: num('Coil voltage', { kind: 'volts', gt: 0, max: 60 }),
	coilOhm: num('Coil resistance', { kind: 'ohms', gt: 0, max: 1e6 }),
	loadSupply: z.enum(['ac', 'dc'], { error: 'Choose AC or DC.' }),
	loadV: num('Load voltage', { kind: 'volts', gt: 0, max: 1000 }),
	loadCurrentA: num('Load current', { kind: 'amps', gt: 0, max: 100 }),
	contactRatingA: num('Contact current rating', { kind: 'amps', gt: 0, max: 100 }),
	contactRatingV: num('Contact voltage rating', { kind: 'volts', gt: 0, max: 1000 }),
	onMs: optNum('Pulse on time', { kind: 'seconds', scale: 1e-3, gt: 0, max: 3600000 }),
	minOnMs: optNum('Minimum on time', { kind: 'seconds', scale: 1e-3, min: 0, max: 3600000 }),
	offMs: optNum('Gap between pulses', { kind: 'seconds', scale: 1e-3, gt: 0, max: 3600000 }),
	minOffMs: optNum('Minimum off time', { kind: 'seconds', scale: 1e-3, min: 0, max: 3600000 }),
	/** Highest share of time the load may be on (fog heaters, solenoid coils); blank when unrated. */
	maxDutyPercent: optNum('Duty rating', { kind: 'percent', gt: 0, max: 100 }).optional()
});

export const outputSettingsSchema = z.discriminatedUnion(
	'kind',
	[ledStringSettings, relaySettings],
	{
		error: 'Choose a kind of output.'
	}
);
export type OutputSettings = z.infer<typeof outputSettingsSchema>;

export const outputSchema = z
	.object({
		name: text('A name'),
		safeState: z.enum(SAFE_STATES, { error: 'Choose what it does on alarm or stop.' }),
		settings: outputSettingsSchema
	})
	.refine((o) => o.settings.kind !== 'relay' || o.safeState !== 'full', {
		message: 'A relay is de-energised or off in its safe state.',
		path: ['safeState']
	});
export type OutputInput = z.infer<typeof outputSchema>;

const point = z.object({ x: num('x', { min: 0, max: 1 }), y: num('y', { min: 0, max: 1 }) });
export const curveSchema = z.discriminatedUnion(
	'kind',
	[
		z.object({ kind: z.literal('linear') }),
		z.object({ kind: z.literal('gamma'), exponent: num('Exponent', { gt: 0, max: 10 }) }),
		z.object({ kind: z.literal('cie') }),
		z.object({
			kind: z.literal('points'),
			points: z.array(point).min(2, 'Draw at least two points.').max(64)
		})
	],
	{ error: 'Choose a curve.' }
);
