import { describe, expect, it } from 'vitest';
import {
	LED_COLOURS,
	RESISTOR_POWER_RATINGS_W,
	checkSwitch,
	ledString,
	resistorRating,
	type SwitchCheckInput
} from './led';
import type { Result } from './result';

function value<T>(result: Result<T>): T {
	if (!result.ok) expect.fail(JSON.stringify(result.issues));
	return result.value;
}

function issues<T>(result: Result<T>): { field: string; message: string }[] {
	if (result.ok) expect.fail('expected input issues');
	return result.issues;
}

describe('LED_COLOURS', () => {
	it('holds the charted forward-voltage ranges at 20 mA', () => {
		// LED reference charts: typical forward voltage ranges at 20 mA
		const charted = {
			red: [1.8, 2.2],
			orange: [2.0, 2.1],
			amber: [2.0, 2.2],
			'yellow-green': [2.0, 2.4],
			green: [2.8, 3.5],
			blue: [3.0, 3.6],
			white: [2.8, 3.6],
			infrared: [1.2, 1.6]
		};
		for (const [colour, [min, max]] of Object.entries(charted)) {
			const entry = LED_COLOURS[colour as keyof typeof LED_COLOURS];
			expect([entry.minV, entry.maxV]).toEqual([min, max]);
		}
	});

	it('takes the middle of each range as typical', () => {
		// LED reference charts: typical = middle of the charted range
		for (const colour of [
			'red',
			'orange',
			'amber',
			'yellow-green',
			'green',
			'blue',
			'infrared'
		] as const) {
			const { minV, maxV, typicalV } = LED_COLOURS[colour];
			expect(typicalV).toBeCloseTo((minV + maxV) / 2, 12);
		}
		// LED reference charts: white commonly 3.0-3.4 V
		expect(LED_COLOURS.white.typicalV).toBeCloseTo((3.0 + 3.4) / 2, 12);
	});
});

describe('resistorRating', () => {
	it('rates at least twice the dissipation from the stocked ratings', () => {
		// common practice, no published source: stocked ratings 1/8, 1/4, 1/2, 1, 2, 3, 5 W
		expect(RESISTOR_POWER_RATINGS_W).toEqual([0.125, 0.25, 0.5, 1, 2, 3, 5]);
		// LED resistor practice: 60 mW -> rate at least 0.125 W
		expect(resistorRating(0.06)).toBe(0.125);
		// common practice, no published source: 2 x 0.1 W = 0.2 W -> 0.25 W; 2 x 1 W -> 2 W
		expect(resistorRating(0.1)).toBe(0.25);
		expect(resistorRating(1)).toBe(2);
		// common practice, no published source: exactly twice the dissipation is enough
		expect(resistorRating(0.0625)).toBe(0.125);
		expect(resistorRating(0.5)).toBe(1);
		expect(resistorRating(2.6)).toBeNull();
	});
});

describe('ledString', () => {
	it('matches the LED resistor worked example', () => {
		// LED resistor practice: 5 V, 2.0 V, 20 mA -> 150 ohm, 60 mW, rate 0.125 W
		const r = value(ledString({ supplyV: 5, forwardV: 2.0, currentA: 0.02 }));
		expect(r.exactOhms).toBeCloseTo(150, 9);
		expect(r.resistorOhms).toBe(150);
		expect(r.currentA).toBeCloseTo(0.02, 12);
		expect(r.resistorPowerW).toBeCloseTo(0.06, 12);
		expect(r.resistorRatingW).toBe(0.125);
		expect(r.series).toBe('E24');
		expect(r.seriesReason).toMatch(/E24.*rounded up/is);
		expect(r.checks).toEqual([]);
	});

	it('rounds a value between series steps up, so current stays under target', () => {
		// LED resistor practice R = (Vs - Vf)/I: (5 - 3.3)/0.020 = 85 ohm; IEC 60063 E24: 82 then 91
		const r = value(ledString({ supplyV: 5, colour: 'blue', currentA: 0.02 }));
		expect(r.forwardV).toBe(3.3);
		expect(r.exactOhms).toBeCloseTo(85, 9);
		expect(r.resistorOhms).toBe(91);
		expect(r.currentA).toBeCloseTo(1.7 / 91, 12);
		expect(r.currentA).toBeLessThan(0.02);
		// I^2*R dissipation; 2 x 31.8 mW -> 0.125 W (common practice)
		expect(r.resistorPowerW).toBeCloseTo((1.7 / 91) ** 2 * 91, 12);
		expect(r.resistorRatingW).toBe(0.125);
		// LED power Vf*I
		expect(r.ledPowerW).toBeCloseTo(3.3 * (1.7 / 91), 12);
		// at the exact 85 ohm the target 20 mA flows: I^2*R = 0.02^2 * 85 = 34 mW (Joule's law)
		expect(r.exactResistorPowerW).toBeCloseTo(0.034, 12);
	});

	it("moves the colour's forward-voltage spread with a typed forward voltage", () => {
		// LED reference chart: red 1.8-2.2 V around a typical 2.0 V; a typed 2.9 V scales it by 1.45
		// to 2.61-3.19 V. At 5 V and 20 mA: R = 2.1/0.02 = 105 ohm, E24 rounds up to 110 ohm
		const r = value(ledString({ supplyV: 5, colour: 'red', forwardV: 2.9, currentA: 0.02 }));
		expect(r.resistorOhms).toBe(110);
		expect(r.currentRangeA!.atMinForwardV).toBeCloseTo((5 - 2.61) / 110, 12);
		expect(r.currentRangeA!.atMaxForwardV).toBeCloseTo((5 - 3.19) / 110, 12);
		// without a typed voltage the chart's own range stands
		const typical = value(ledString({ supplyV: 5, colour: 'red', currentA: 0.02 }));
		expect(typical.currentRangeA!.atMaxForwardV).toBeCloseTo((5 - 2.2) / typical.resistorOhms, 12);
	});

	it('snaps to the series asked for', () => {
		// IEC 60063 E96 formula: 84.5 then 86.6
		const r = value(ledString({ supplyV: 5, forwardV: 3.3, currentA: 0.02, series: 'E96' }));
		expect(r.resistorOhms).toBe(86.6);
		expect(r.currentA).toBeCloseTo(1.7 / 86.6, 12);
		expect(r.seriesReason).toMatch(/E96/);
	});

	it('subtracts every LED in the string and the switch drop', () => {
		// LED resistor practice R = (Vs - n*Vf - Vswitch)/I: (12 - 3*3.2)/0.020 = 120 ohm (E24)
		const r = value(ledString({ supplyV: 12, colour: 'white', ledsInSeries: 3, currentA: 0.02 }));
		expect(r.headroomV).toBeCloseTo(2.4, 12);
		expect(r.resistorOhms).toBe(120);
		expect(r.currentA).toBeCloseTo(0.02, 12);
		// (5 - 2.0 - 0.2)/0.020 = 140 ohm; IEC 60063 E24: 130 then 150
		const s = value(ledString({ supplyV: 5, forwardV: 2.0, switchDropV: 0.2, currentA: 0.02 }));
		expect(s.exactOhms).toBeCloseTo(140, 9);
		expect(s.resistorOhms).toBe(150);
		expect(s.currentA).toBeCloseTo(2.8 / 150, 12);
	});

	it('adds up strings in parallel', () => {
		// Kirchhoff's current law: four 20 mA strings draw 80 mA, 0.96 W from 12 V
		const r = value(
			ledString({ supplyV: 12, colour: 'white', ledsInSeries: 3, currentA: 0.02, strings: 4 })
		);
		expect(r.totalCurrentA).toBeCloseTo(0.08, 12);
		expect(r.totalPowerW).toBeCloseTo(0.96, 12);
	});

	it('rates a hot resistor and warns above 20 mA', () => {
		// LED resistor practice: (12 - 2.0)/0.1 = 100 ohm, 1 W, rate 2 W (common practice, x2)
		const r = value(ledString({ supplyV: 12, forwardV: 2.0, currentA: 0.1 }));
		expect(r.resistorOhms).toBe(100);
		expect(r.resistorPowerW).toBeCloseTo(1, 12);
		expect(r.resistorRatingW).toBe(2);
		// reference-values: 20 mA is the usual maximum for small indicator LEDs
		expect(r.checks.map((c) => c.code)).toEqual(['led-current']);
	});

	it('fails when no stocked rating is large enough', () => {
		// LED resistor practice: (24 - 2.0)/1 = 22 ohm, 22 W; common practice, no published source: 5 W max
		const r = value(ledString({ supplyV: 24, forwardV: 2.0, currentA: 1 }));
		expect(r.resistorOhms).toBe(22);
		expect(r.resistorPowerW).toBeCloseTo(22, 9);
		expect(r.resistorRatingW).toBeNull();
		expect(r.checks.find((c) => c.code === 'resistor-power')?.level).toBe('fail');
	});

	it('gives the current across the forward-voltage spread', () => {
		// LED reference charts: red 1.8-2.2 V; (5 - Vf)/150 ohm
		const r = value(ledString({ supplyV: 5, colour: 'red', currentA: 0.02 }));
		expect(r.resistorOhms).toBe(150);
		expect(r.currentRangeA?.atMinForwardV).toBeCloseTo(3.2 / 150, 12);
		expect(r.currentRangeA?.atMaxForwardV).toBeCloseTo(2.8 / 150, 12);
		// LED resistor practice without a colour: no spread known
		expect(value(ledString({ supplyV: 5, forwardV: 2, currentA: 0.02 })).currentRangeA).toBeNull();
	});

	it('warns when the top of the spread leaves no headroom', () => {
		// LED reference charts: green up to 3.5 V; 3 x 3.5 = 10.5 V exceeds a 10 V supply
		const r = value(ledString({ supplyV: 10, colour: 'green', ledsInSeries: 3, currentA: 0.02 }));
		expect(r.checks.map((c) => c.code)).toEqual(['forward-voltage-spread']);
		expect(r.currentRangeA?.atMaxForwardV).toBe(0);
	});

	it('gives a clear error, not NaN, when there is no headroom', () => {
		// LED resistor practice: R = (Vs - n*Vf)/I needs Vs > n*Vf; 2 x 3.3 V > 5 V
		const over = issues(ledString({ supplyV: 5, forwardV: 3.3, ledsInSeries: 2, currentA: 0.02 }));
		expect(over).toHaveLength(1);
		expect(over[0].field).toBe('supplyV');
		expect(over[0].message).toMatch(/no headroom/i);
		// exactly zero headroom would divide to zero ohms
		const zero = issues(
			ledString({ supplyV: 6.6, forwardV: 3.3, ledsInSeries: 2, currentA: 0.02 })
		);
		expect(zero[0].message).toMatch(/no headroom/i);
		// the switch drop eats the last of it: 5 - 3.0 - 2.0 = 0
		const viaSwitch = issues(
			ledString({ supplyV: 5, forwardV: 3, switchDropV: 2, currentA: 0.02 })
		);
		expect(viaSwitch[0].message).toMatch(/no headroom.*switch/i);
	});

	it('asks for a forward voltage and a positive current', () => {
		// LED resistor practice: R = (Vs - n*Vf)/I needs Vf and I > 0
		expect(issues(ledString({ supplyV: 5, currentA: 0.02 })).map((i) => i.field)).toEqual([
			'forwardV'
		]);
		expect(issues(ledString({ supplyV: 5, forwardV: 2, currentA: 0 })).map((i) => i.field)).toEqual(
			['currentA']
		);
		expect(
			issues(ledString({ supplyV: 5, forwardV: 2, currentA: 0.02, ledsInSeries: 1.5 })).map(
				(i) => i.field
			)
		).toEqual(['ledsInSeries']);
	});
});

describe('checkSwitch', () => {
	// reference-values: small-signal N-channel MOSFET, TO-92, 60 V class: ID 200 mA,
	// VGS(th) 0.8-3.0 V, PD 350-400 mW, RDS(on) about 5 ohm at VGS 10 V (memory)
	const smallMosfet: SwitchCheckInput = {
		logicHighV: 3.3,
		gateThresholdMaxV: 3.0,
		rdsOnDriveV: 10,
		rdsOnOhm: 5,
		drainCurrentA: 0.1,
		continuousDrainA: 0.2,
		maxPowerW: 0.35
	};

	it('warns that 3.3 V logic may not turn a small 60 V part fully on', () => {
		// reference-values: a 3.3 V logic output may not turn such a part fully on
		// common practice, no published source: drive the gate to at least 2 x VGS(th) max
		const r = value(checkSwitch(smallMosfet));
		expect(r.checks.map((c) => c.code)).toEqual(['gate-drive-low', 'gate-below-rds-drive']);
		expect(r.checks[0].basis).toBe('common practice');
		expect(r.passes).toBe(true);
		// Ohm's law I*RDS(on) and I^2*RDS(on), lower bounds below the 10 V test drive
		expect(r.dropV).toBeCloseTo(0.5, 12);
		expect(r.dissipationW).toBeCloseTo(0.05, 12);
	});

	it('passes a gate driven at the datasheet RDS(on) voltage', () => {
		// reference-values: RDS(on) quoted at VGS 10 V (memory); 10 V >= 2 x 3.0 V
		const r = value(checkSwitch({ ...smallMosfet, logicHighV: 10 }));
		expect(r.checks).toEqual([]);
		expect(r.passes).toBe(true);
	});

	it('fails a gate below the maximum threshold', () => {
		// reference-values: VGS(th) up to 3.0 V, so 2.5 V may leave the part off
		const r = value(checkSwitch({ ...smallMosfet, logicHighV: 2.5 }));
		expect(r.checks[0].code).toBe('gate-below-threshold');
		expect(r.passes).toBe(false);
	});

	it('fails a drain current above the continuous rating', () => {
		// reference-values: ID 200 mA continuous; 250 mA is over
		const r = value(checkSwitch({ ...smallMosfet, logicHighV: 10, drainCurrentA: 0.25 }));
		expect(r.checks.map((c) => c.code)).toEqual(['drain-over-rating']);
		expect(r.passes).toBe(false);
	});

	it('fails dissipation above the power limit', () => {
		// reference-values: PD 350 mW; I^2*R = 0.2^2 x 10 = 0.4 W
		const r = value(
			checkSwitch({ ...smallMosfet, logicHighV: 10, drainCurrentA: 0.2, rdsOnOhm: 10 })
		);
		expect(r.dissipationW).toBeCloseTo(0.2 ** 2 * 10, 12);
		expect(r.checks.map((c) => c.code)).toEqual(['switch-power']);
	});

	it('rejects a missing rating', () => {
		// reference-values: the datasheet gives ID; zero cannot be checked against
		expect(checkSwitch({ ...smallMosfet, continuousDrainA: 0 }).ok).toBe(false);
	});
});
