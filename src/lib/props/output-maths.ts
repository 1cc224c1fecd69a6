// Output maths from saved settings, shared by the output page, the API and the browser.
import {
	LED_COLOURS,
	checkRelay,
	checkSwitch,
	ledString,
	type LedColour,
	type RelayLoadKind
} from '$lib/electronics';
import type { RelayKind } from '$lib/schemas/prop-words';

export type LedSettingsLike = {
	colour: string;
	forwardV: number;
	ledsInSeries: number;
	strings: number;
	currentMa: number;
	supplyV: number;
	switchDropV: number;
	logicHighV: number;
	gateThresholdMaxV: number;
	continuousDrainMa: number;
};

export function ledMaths(s: LedSettingsLike) {
	const colour = s.colour in LED_COLOURS ? (s.colour as LedColour) : undefined;
	const led = ledString({
		supplyV: s.supplyV,
		colour,
		forwardV: s.forwardV,
		ledsInSeries: s.ledsInSeries,
		strings: s.strings,
		currentA: s.currentMa / 1000,
		switchDropV: s.switchDropV
	});
	const sw = led.ok
		? checkSwitch({
				logicHighV: s.logicHighV,
				gateThresholdMaxV: s.gateThresholdMaxV,
				drainCurrentA: led.value.totalCurrentA,
				continuousDrainA: s.continuousDrainMa / 1000
			})
		: null;
	return { led, sw };
}

export const RELAY_LOADS: Record<RelayKind, RelayLoadKind> = {
	pneumatic: 'pneumatic-valve',
	solenoid: 'solenoid',
	fog: 'fog',
	audio: 'audio-trigger',
	strobe: 'strobe'
};

export type RelaySettingsLike = {
	relayKind: RelayKind;
	coilV: number;
	coilOhm: number;
	loadSupply: 'ac' | 'dc';
	loadV: number;
	loadCurrentA: number;
	contactRatingA: number;
	contactRatingV: number;
	onMs: number | null;
	minOnMs: number | null;
	offMs: number | null;
	minOffMs: number | null;
};

export function relayMaths(s: RelaySettingsLike, pinLimitMa: number | null) {
	const pulse =
		s.onMs !== null && s.onMs !== undefined
			? {
					onS: s.onMs / 1000,
					minOnS: (s.minOnMs ?? 0) / 1000,
					offS: s.offMs == null ? undefined : s.offMs / 1000,
					minOffS: s.minOffMs == null ? undefined : s.minOffMs / 1000
				}
			: undefined;
	return checkRelay({
		coilV: s.coilV,
		coilOhm: s.coilOhm,
		pinLimitA: (pinLimitMa ?? 20) / 1000,
		loadKind: RELAY_LOADS[s.relayKind] ?? 'other',
		loadSupply: s.loadSupply,
		loadV: s.loadV,
		loadCurrentA: s.loadCurrentA,
		contactRatingA: s.contactRatingA,
		contactRatingV: s.contactRatingV,
		pulse
	});
}

/** Safety cautions an output calls for: pneumatics, strobes, fog, and loads above extra-low voltage. */
export function hazardsOf(o: {
	kind: string;
	relayKind?: string | null;
	settings: Record<string, unknown>;
}): string[] {
	const out: string[] = [];
	if (o.kind === 'relay') {
		if (o.relayKind === 'pneumatic') out.push('pneumatics');
		if (o.relayKind === 'strobe') out.push('strobe');
		if (o.relayKind === 'fog') out.push('fog');
		const v = Number(o.settings.loadV);
		const limit = o.settings.loadSupply === 'ac' ? 50 : 120;
		if (v > limit) out.push('mains-powered load');
	}
	return out;
}
