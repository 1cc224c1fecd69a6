// Enum values and their labels for props, sensors and outputs (words from the glossary).
export const PROP_STATUSES = [
	'design',
	'bench',
	'installed',
	'show_ready',
	'stood_down',
	'retired'
] as const;
export type PropStatus = (typeof PROP_STATUSES)[number];
export const PROP_STATUS_LABELS: Record<PropStatus, string> = {
	design: 'Design',
	bench: 'On the bench',
	installed: 'Installed',
	show_ready: 'Show-ready',
	stood_down: 'Stood down',
	retired: 'Retired'
};

export const SENSOR_KINDS = [
	'capacitive',
	'motion',
	'break_beam',
	'ranging',
	'pressure_mat',
	'button'
] as const;
export type SensorKind = (typeof SENSOR_KINDS)[number];
export const SENSOR_KIND_LABELS: Record<SensorKind, string> = {
	capacitive: 'Capacitive plate',
	motion: 'Motion (PIR)',
	break_beam: 'Break-beam',
	ranging: 'Ranging',
	pressure_mat: 'Pressure mat',
	button: 'Manual button'
};
/** Each kind's known troubles, shown beside its trigger range. Common practice. */
export const SENSOR_KIND_HINTS: Record<SensorKind, string> = {
	capacitive:
		'Readings drift with humidity and temperature; keep the plate lead short and recalibrate when the weather turns.',
	motion:
		'Needs a warm-up of up to a minute after power-on, and is slow to re-arm after a trigger.',
	break_beam: 'Sunlight and fog can blind the receiver; a loose mount misaligns the beam.',
	ranging:
		'Ultrasonic sensing misses soft costumes and fabric; the speed of sound changes with air temperature.',
	pressure_mat: 'Wears out under heavy footfall; check the lead where guests step.',
	button: 'Guests press it harder than you expect; use a vandal-resistant switch and debounce it.'
};

export const OUTPUT_KINDS = ['led_string', 'relay'] as const;
export type OutputKind = (typeof OUTPUT_KINDS)[number];
export const OUTPUT_KIND_LABELS: Record<OutputKind, string> = {
	led_string: 'LED string (PWM)',
	relay: 'Relay'
};

export const RELAY_KINDS = ['pneumatic', 'solenoid', 'fog', 'audio', 'strobe'] as const;
export type RelayKind = (typeof RELAY_KINDS)[number];
export const RELAY_KIND_LABELS: Record<RelayKind, string> = {
	pneumatic: 'Pneumatic valve',
	solenoid: 'Solenoid',
	fog: 'Fog',
	audio: 'Audio trigger',
	strobe: 'Strobe'
};

export const SAFE_STATES = ['full', 'off', 'de_energised'] as const;
export type SafeState = (typeof SAFE_STATES)[number];
export const SAFE_STATE_LABELS: Record<SafeState, string> = {
	full: 'Lights to full',
	off: 'Off',
	de_energised: 'De-energised'
};

/**
 * What a board's reading of each kind is: a count, a distance, or on/off. The simulator and the
 * firmware header follow the same: plates send timer counts, ranging sensors millimetres, the
 * rest 1 for someone there (beam broken, movement, mat stepped on, pressed) and 0 for nobody.
 */
export const READING_UNITS: Record<SensorKind, { unit: string; onOff: boolean }> = {
	capacitive: { unit: 'counts', onOff: false },
	ranging: { unit: 'mm', onOff: false },
	motion: { unit: '', onOff: true },
	break_beam: { unit: '', onOff: true },
	pressure_mat: { unit: '', onOff: true },
	button: { unit: '', onOff: true }
};
