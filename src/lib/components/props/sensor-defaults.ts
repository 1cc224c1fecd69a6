import type { SensorKind } from '$lib/schemas/prop-words';

/** Starting values for a new sensor of each kind; every one can be changed. */
export const SENSOR_DEFAULTS: Record<SensorKind, Record<string, string>> = {
	capacitive: {
		resistanceOhm: '1000000',
		plateAreaCm2: '100',
		gapMm: '20',
		strayPf: '10',
		samplesAveraged: '8',
		readingNoiseCounts: '2',
		handFraction: '0.5'
	},
	motion: { warmUpS: '60', rangeM: '6' },
	break_beam: { beamLengthM: '1.5' },
	ranging: { method: 'ultrasonic', airTempC: '15', maxRangeM: '3' },
	pressure_mat: { zones: '1' },
	button: { latching: '' }
};

export const SENSOR_FIELDS: Record<
	SensorKind,
	{ name: string; label: string; unit?: string; choices?: [string, string][] }[]
> = {
	capacitive: [
		{ name: 'resistanceOhm', label: 'Discharge resistor', unit: 'Ω' },
		{ name: 'plateAreaCm2', label: 'Plate area', unit: 'cm²' },
		{ name: 'gapMm', label: 'Gap to the hand', unit: 'mm' },
		{ name: 'strayPf', label: 'Stray capacitance', unit: 'pF' },
		{ name: 'samplesAveraged', label: 'Readings averaged' },
		{ name: 'readingNoiseCounts', label: 'Noise per reading', unit: 'counts' },
		{ name: 'handFraction', label: 'Hand fills of the gap', unit: '0–1' }
	],
	motion: [
		{ name: 'warmUpS', label: 'Warm-up', unit: 's' },
		{ name: 'rangeM', label: 'Range', unit: 'm' }
	],
	break_beam: [{ name: 'beamLengthM', label: 'Beam length', unit: 'm' }],
	ranging: [
		{
			name: 'method',
			label: 'Measures by',
			choices: [
				['ultrasonic', 'Ultrasonic'],
				['time_of_flight', 'Time of flight (light)']
			]
		},
		{ name: 'airTempC', label: 'Air temperature', unit: '°C' },
		{ name: 'maxRangeM', label: 'Longest range', unit: 'm' }
	],
	pressure_mat: [{ name: 'zones', label: 'Zones' }],
	button: [
		{
			name: 'latching',
			label: 'Latching',
			choices: [
				['', 'Momentary'],
				['on', 'Latching']
			]
		}
	]
};

/** The trigger range every sensor has, beside its kind's own settings. */
export const RANGE_FIELDS: { name: string; label: string; unit?: string }[] = [
	{ name: 'near', label: 'Near end' },
	{ name: 'far', label: 'Far end' },
	{ name: 'hysteresis', label: 'Hysteresis' },
	{ name: 'debounceMs', label: 'Debounce', unit: 'ms' },
	{ name: 'rearmMs', label: 'Re-arm', unit: 'ms' }
];
