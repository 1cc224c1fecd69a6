import { RELAY_KINDS, RELAY_KIND_LABELS } from '$lib/schemas/prop-words';
import { LED_COLOURS } from '$lib/electronics';

export const OUTPUT_DEFAULTS: Record<'led_string' | 'relay', Record<string, string>> = {
	led_string: {
		colour: 'white',
		forwardV: '3.2',
		ledsInSeries: '3',
		strings: '4',
		currentMa: '20',
		supplyV: '12',
		switchDropV: '0.1',
		logicHighV: '5',
		gateThresholdMaxV: '2.5',
		continuousDrainMa: '200'
	},
	relay: {
		relayKind: 'pneumatic',
		coilV: '5',
		coilOhm: '70',
		loadSupply: 'dc',
		loadV: '12',
		loadCurrentA: '0.5',
		contactRatingA: '10',
		contactRatingV: '30',
		onMs: '250',
		minOnMs: '50',
		offMs: '1000',
		minOffMs: '200',
		maxDutyPercent: ''
	}
};

type Field = { name: string; label: string; unit?: string; choices?: [string, string][] };
export const OUTPUT_FIELDS: Record<'led_string' | 'relay', Field[]> = {
	led_string: [
		{
			name: 'colour',
			label: 'LED colour',
			choices: Object.entries(LED_COLOURS).map(([k, v]) => [k, v.label])
		},
		{ name: 'forwardV', label: 'Forward voltage', unit: 'V' },
		{ name: 'ledsInSeries', label: 'LEDs in series' },
		{ name: 'strings', label: 'Strings in parallel' },
		{ name: 'currentMa', label: 'Current per string', unit: 'mA' },
		{ name: 'supplyV', label: 'String supply', unit: 'V' },
		{ name: 'switchDropV', label: 'Switch drop', unit: 'V' },
		{ name: 'logicHighV', label: 'Logic high', unit: 'V' },
		{ name: 'gateThresholdMaxV', label: 'Gate threshold, max', unit: 'V' },
		{ name: 'continuousDrainMa', label: 'Switch drain rating', unit: 'mA' }
	],
	relay: [
		{
			name: 'relayKind',
			label: 'Drives',
			choices: RELAY_KINDS.map((k) => [k, RELAY_KIND_LABELS[k]])
		},
		{ name: 'coilV', label: 'Coil voltage', unit: 'V' },
		{ name: 'coilOhm', label: 'Coil resistance', unit: 'Ω' },
		{
			name: 'loadSupply',
			label: 'Load supply',
			choices: [
				['dc', 'DC'],
				['ac', 'AC']
			]
		},
		{ name: 'loadV', label: 'Load voltage', unit: 'V' },
		{ name: 'loadCurrentA', label: 'Load current', unit: 'A' },
		{ name: 'contactRatingA', label: 'Contact rating', unit: 'A' },
		{ name: 'contactRatingV', label: 'Contact rating', unit: 'V' },
		{ name: 'onMs', label: 'Pulse on time', unit: 'ms' },
		{ name: 'minOnMs', label: 'Minimum on time', unit: 'ms' },
		{ name: 'offMs', label: 'Gap between pulses', unit: 'ms' },
		{ name: 'minOffMs', label: 'Minimum off time', unit: 'ms' },
		{ name: 'maxDutyPercent', label: 'Duty rating (optional)', unit: '%' }
	]
};
