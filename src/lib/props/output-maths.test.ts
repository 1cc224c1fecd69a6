import { describe, expect, it } from 'vitest';
import { hazardsOf, ledMaths, relayMaths } from './output-maths';

const base = {
	colour: 'red',
	forwardV: 2,
	ledsInSeries: 1,
	strings: 1,
	currentMa: 20,
	supplyV: 5,
	switchDropV: 0,
	logicHighV: 5,
	gateThresholdMaxV: 2,
	continuousDrainMa: 200
};

describe('ledMaths', () => {
	it('gives 150 ohm for 5 V, one 2.0 V LED at 20 mA', () => {
		// LED calculator references, common practice: (5 - 2)/0.02 = 150 ohm, 60 mW, rate 0.125 W
		const { led } = ledMaths(base);
		expect(led.ok).toBe(true);
		if (!led.ok) return;
		expect(led.value.exactOhms).toBeCloseTo(150, 9);
		expect(led.value.resistorOhms).toBe(150); // IEC 60063 E24 holds 150
		expect(led.value.resistorPowerW).toBeCloseTo(0.06, 9);
		expect(led.value.resistorRatingW).toBe(0.125);
	});
	it('reports no headroom as an error, not NaN', () => {
		const { led, sw } = ledMaths({ ...base, ledsInSeries: 3 });
		expect(led.ok).toBe(false);
		expect(sw).toBeNull();
		if (!led.ok) expect(led.issues[0].message).toMatch(/No headroom/);
	});
	it('flags a 3.3 V gate drive below a 3.0 V-max threshold part as a risk', () => {
		// generic small-signal MOSFET datasheets: VGS(th) up to 3.0 V
		const { sw } = ledMaths({ ...base, logicHighV: 2.5, gateThresholdMaxV: 3 });
		expect(sw?.ok && sw.value.passes).toBe(false);
	});
});

describe('relayMaths', () => {
	const relay = {
		relayKind: 'pneumatic' as const,
		coilV: 5,
		coilOhm: 70,
		loadSupply: 'dc' as const,
		loadV: 12,
		loadCurrentA: 0.5,
		contactRatingA: 10,
		contactRatingV: 30,
		onMs: 50,
		minOnMs: 100,
		offMs: null,
		minOffMs: null
	};
	it('needs a driver when the coil draws more than the pin limit', () => {
		// Ohm's law: 5 V / 70 ohm = 71.4 mA > 20 mA
		const r = relayMaths(relay, 20);
		expect(r.ok && r.value.driverNeeded).toBe(true);
		expect(r.ok && r.value.coilCurrentA).toBeCloseTo(5 / 70, 12);
	});
	it('fails a pulse shorter than the minimum on time', () => {
		const r = relayMaths(relay, 40);
		expect(r.ok && r.value.checks.some((c) => c.code === 'pulse-too-short')).toBe(true);
	});
});

describe('hazardsOf', () => {
	it('names pneumatics, strobes, fog and mains loads', () => {
		expect(hazardsOf({ kind: 'relay', relayKind: 'pneumatic', settings: { loadV: 12 } })).toEqual([
			'pneumatics'
		]);
		// IEC 61140 extra-low voltage: 50 V AC
		expect(
			hazardsOf({ kind: 'relay', relayKind: 'fog', settings: { loadV: 230, loadSupply: 'ac' } })
		).toEqual(['fog', 'mains-powered load']);
		expect(hazardsOf({ kind: 'led_string', settings: {} })).toEqual([]);
	});
});
