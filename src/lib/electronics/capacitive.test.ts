import { describe, expect, it } from 'vitest';
import {
	EPS0,
	EPS_R_AIR,
	EPS_R_WATER,
	capacitivePlate,
	cm2ToM2,
	fToPf,
	mmToM,
	rcTime,
	rcVoltage,
	type CapacitivePlateInput
} from './capacitive';
import type { Result } from './result';

function value<T>(result: Result<T>): T {
	if (!result.ok) expect.fail(JSON.stringify(result.issues));
	return result.value;
}

function fields<T>(result: Result<T>): string[] {
	if (result.ok) expect.fail('expected input issues');
	return result.issues.map((i) => i.field);
}

// CODATA 2018 eps0, written out so a typo in the module shows up
const CODATA_EPS0 = 8.8541878128e-12;

const plate: CapacitivePlateInput = {
	resistanceOhm: 1e6,
	plateAreaM2: cm2ToM2(100),
	gapM: mmToM(10),
	strayCapacitanceF: 10e-12,
	supplyV: 5,
	referenceV: 1.1,
	timerClockHz: 16e6,
	prescaler: 8,
	timerBits: 16
};

describe('constants', () => {
	it('uses the published permittivities', () => {
		// reference-values: CODATA 2018 eps0 = 8.8541878128e-12 F/m
		expect(EPS0).toBe(CODATA_EPS0);
		// reference-values: dry air eps_r = 1.000536 at 20 °C
		expect(EPS_R_AIR).toBe(1.000536);
		// reference-values: water eps_r about 80 at 20 °C
		expect(EPS_R_WATER).toBe(80);
	});
});

describe('rcTime and rcVoltage', () => {
	it('matches the published worked example', () => {
		// RC worked example: 0.1 uF, 1 Mohm, from 5 V toward 3.3 V, reaches 4 V after 88.7 ms
		const t = value(
			rcTime({ resistanceOhm: 1e6, capacitanceF: 0.1e-6, startV: 5, finalV: 3.3, targetV: 4 })
		);
		expect(t * 1000).toBeCloseTo(88.7, 1);
		// same example, from the published formula RC*ln(1.7/0.7)
		expect(t).toBeCloseTo(0.1 * Math.log(1.7 / 0.7), 12);
	});

	it('discharges to ground by RC*ln(V0/Vth)', () => {
		// reference-values: discharge time from V0 to Vth is RC*ln(V0/Vth)
		const t = value(
			rcTime({ resistanceOhm: 2.2e6, capacitanceF: 47e-12, startV: 5, targetV: 1.1 })
		);
		expect(t / (2.2e6 * 47e-12 * Math.log(5 / 1.1))).toBeCloseTo(1, 12);
	});

	it('completes 63.21 % of the step after one time constant', () => {
		// reference-values: after one time constant 63.21 % of the step is done
		const v = value(
			rcVoltage({ resistanceOhm: 1e6, capacitanceF: 1e-6, startV: 0, finalV: 10, timeS: 1 })
		);
		expect(v / 10).toBeCloseTo(0.6321, 4);
	});

	it('leaves less than 1 % after five time constants', () => {
		// reference-values: after 5 tau less than 1 % remains
		const v = value(rcVoltage({ resistanceOhm: 1e3, capacitanceF: 1e-6, startV: 5, timeS: 5e-3 }));
		expect(v).toBeLessThan(0.05);
		expect(v).toBeGreaterThan(0);
	});

	it('rejects a target the node never crosses', () => {
		// reference-values: V(t) = Vx + (V0 - Vx)e^(-t/RC) never reaches Vx or goes past V0
		expect(
			fields(rcTime({ resistanceOhm: 1e6, capacitanceF: 1e-9, startV: 5, targetV: 0 }))
		).toEqual(['targetV']);
		expect(
			fields(rcTime({ resistanceOhm: 1e6, capacitanceF: 1e-9, startV: 5, targetV: 6 }))
		).toEqual(['targetV']);
		expect(fields(rcTime({ resistanceOhm: 0, capacitanceF: 1e-9, startV: 5, targetV: 1 }))).toEqual(
			['resistanceOhm']
		);
	});
});

describe('capacitivePlate', () => {
	it('gives 88.54 pF for 10 cm x 10 cm at 1 mm in air', () => {
		// reference-values: parallel plate 10 cm x 10 cm at 1 mm in air -> 88.54 pF (CODATA 2018 eps0)
		const r = value(
			capacitivePlate({ ...plate, gapM: mmToM(1), dielectricEpsR: 1, strayCapacitanceF: 0 })
		);
		expect(fToPf(r.plateCapacitanceF)).toBeCloseTo(88.54, 2);
		expect(fToPf(r.capacitanceF)).toBeCloseTo(88.54, 2);
	});

	it('defaults the gap to dry air and adds stray capacitance', () => {
		// reference-values: C = eps0*eps_r*A/d with dry air eps_r = 1.000536, plus Cstray in parallel
		const r = value(capacitivePlate(plate));
		const expectedPlate = (CODATA_EPS0 * 1.000536 * 0.01) / 0.01;
		expect(r.plateCapacitanceF / expectedPlate).toBeCloseTo(1, 12);
		expect(r.capacitanceF / (expectedPlate + 10e-12)).toBeCloseTo(1, 12);
	});

	it('times the discharge and converts it to timer counts', () => {
		// reference-values: t = R*C*ln(V0/Vref); counts = t*f/prescaler (microcontroller timer)
		const r = value(capacitivePlate(plate));
		const c = (CODATA_EPS0 * 1.000536 * 0.01) / 0.01 + 10e-12;
		const t = 1e6 * c * Math.log(5 / 1.1);
		expect(r.dischargeTimeS / t).toBeCloseTo(1, 12);
		expect(r.counts).toBeCloseTo((t * 16e6) / 8, 9);
		// one extra pF adds R*1e-12*ln(V0/Vref)*f/prescaler counts
		expect(r.countsPerPf).toBeCloseTo((1e6 * 1e-12 * Math.log(5 / 1.1) * 16e6) / 8, 12);
		expect(r.timerRangeCounts).toBe(65536);
		expect(r.overflow).toBe(false);
		expect(r.checks).toEqual([]);
	});

	it('warns when a reading reaches 2^bits counts', () => {
		// microcontroller timer: an n-bit counter holds 0..2^n - 1; about 57 counts wraps 5 bits
		const c = (CODATA_EPS0 * 1.000536 * 0.01) / 0.01 + 10e-12;
		const counts = (1e6 * c * Math.log(5 / 1.1) * 16e6) / 8;
		expect(counts).toBeGreaterThan(32);
		expect(counts).toBeLessThan(64);
		const five = value(capacitivePlate({ ...plate, timerBits: 5 }));
		expect(five.overflow).toBe(true);
		expect(five.timerRangeCounts).toBe(32);
		expect(five.checks.map((c) => c.code)).toEqual(['timer-overflow']);
		const six = value(capacitivePlate({ ...plate, timerBits: 6 }));
		expect(six.overflow).toBe(false);
	});

	it('warns when only the hand reading would overflow', () => {
		// microcontroller timer range 2^bits; hand C from the series dielectric model, eps_r 80
		const area = 0.01;
		const d = 0.01;
		const handC = (CODATA_EPS0 * area) / (d / 2 / 1.000536 + d / 2 / 80) + 10e-12;
		const handCounts = (1e6 * handC * Math.log(5 / 1.1) * 16e6) / 8;
		expect(handCounts).toBeGreaterThan(64);
		expect(handCounts).toBeLessThan(128);
		const r = value(capacitivePlate({ ...plate, timerBits: 6 }));
		expect(r.overflow).toBe(false);
		expect(r.hand.overflow).toBe(true);
		expect(r.checks.map((c) => c.code)).toEqual(['timer-overflow-hand']);
	});

	it('averages N readings back to back for the update rate', () => {
		// rate = 1/(N*(t + overhead)): N readings per update, one after another
		const c = (CODATA_EPS0 * 1.000536 * 0.01) / 0.01 + 10e-12;
		const t = 1e6 * c * Math.log(5 / 1.1);
		const r = value(capacitivePlate({ ...plate, samplesAveraged: 16 }));
		expect(r.updateRateHz / (1 / (16 * t))).toBeCloseTo(1, 12);
		const slow = value(capacitivePlate({ ...plate, samplesAveraged: 16, sampleOverheadS: 1e-3 }));
		expect(slow.updateRateHz / (1 / (16 * (t + 1e-3)))).toBeCloseTo(1, 12);
	});

	it('adds the recharge time to each reading and the loop overhead to each update', () => {
		// timing budget of one update: N * (recharge + discharge + per-reading code) + loop
		const c = (CODATA_EPS0 * 1.000536 * 0.01) / 0.01 + 10e-12;
		const t = 1e6 * c * Math.log(5 / 1.1);
		const r = value(
			capacitivePlate({ ...plate, samplesAveraged: 8, rechargeTimeS: 10e-6, loopOverheadS: 2e-3 })
		);
		expect(r.updateRateHz / (1 / (8 * (10e-6 + t) + 2e-3))).toBeCloseTo(1, 12);
		const bad = capacitivePlate({ ...plate, loopOverheadS: -1 });
		expect(bad.ok).toBe(false);
	});

	it('warns when the idle reading is too coarse to see a hand', () => {
		// the base plate reads about 57 counts at a prescaler of 8; at 64 it is 8 times fewer (about 7)
		// below 50 counts one count is over 2 % of the reading (common practice, no published source)
		expect(value(capacitivePlate(plate)).checks.map((c) => c.code)).toEqual([]);
		const coarse = value(capacitivePlate({ ...plate, prescaler: 64 }));
		expect(coarse.counts).toBeCloseTo(value(capacitivePlate(plate)).counts / 8, 9);
		expect(coarse.checks.map((c) => c.code)).toEqual(['coarse-resolution']);
		expect(coarse.checks[0].message).toMatch(/^An idle reading of about 7\.\d+ counts is coarse/);
	});

	it('gives quantisation noise of 1/sqrt(12) counts for one clean reading', () => {
		// reference-values: quantisation noise of a uniform step q is q/sqrt(12)
		const r = value(capacitivePlate(plate));
		expect(r.noiseCounts).toBeCloseTo(0.288675, 6);
	});

	it('reduces the noise of the mean by sqrt(N)', () => {
		// reference-values: standard error of a mean sigma/sqrt(N); quantisation variance 1/12 count^2
		const r = value(capacitivePlate({ ...plate, readingNoiseCounts: 2, samplesAveraged: 16 }));
		expect(r.noiseCounts).toBeCloseTo(Math.sqrt(4 + 1 / 12) / 4, 12);
	});

	it('estimates a hand filling half the gap with a series dielectric', () => {
		// reference-values: series layers C = eps0*A/(d_air/eps_air + d_hand/eps_hand), water eps_r 80
		const r = value(capacitivePlate({ ...plate, readingNoiseCounts: 1 }));
		const handC = (CODATA_EPS0 * 0.01) / (0.005 / 1.000536 + 0.005 / 80) + 10e-12;
		const handCounts = (1e6 * handC * Math.log(5 / 1.1) * 16e6) / 8;
		expect(r.hand.estimate).toBe(true);
		expect(r.hand.handFraction).toBe(0.5);
		expect(r.hand.capacitanceF / handC).toBeCloseTo(1, 12);
		expect(r.hand.counts).toBeCloseTo(handCounts, 9);
		expect(r.hand.changeCounts).toBeCloseTo(handCounts - r.counts, 9);
		expect(r.hand.changeInNoise).toBeCloseTo((handCounts - r.counts) / Math.sqrt(1 + 1 / 12), 9);
	});

	it('reduces to the parallel-plate formula at the ends of the hand range', () => {
		// reference-values: parallel plate C = eps0*eps_r*A/d with water eps_r 80 filling the gap
		const full = value(capacitivePlate({ ...plate, strayCapacitanceF: 0, handFraction: 1 }));
		expect(full.hand.capacitanceF / ((CODATA_EPS0 * 80 * 0.01) / 0.01)).toBeCloseTo(1, 12);
		// reference-values: parallel plate in dry air when no hand is present
		const none = value(capacitivePlate({ ...plate, handFraction: 0 }));
		expect(none.hand.capacitanceF / none.capacitanceF).toBeCloseTo(1, 12);
		expect(none.hand.changeCounts).toBeCloseTo(0, 9);
	});

	it('rejects a reference at or above the supply', () => {
		// reference-values: discharge from V0 toward 0 only crosses Vref when Vref < V0
		expect(fields(capacitivePlate({ ...plate, referenceV: 5 }))).toEqual(['referenceV']);
		expect(fields(capacitivePlate({ ...plate, referenceV: 6 }))).toEqual(['referenceV']);
	});

	it('lists every bad input rather than returning NaN', () => {
		// reference-values: C = eps0*eps_r*A/d and t = R*C*ln(V0/Vref) need R, A, d > 0
		const result = capacitivePlate({
			...plate,
			resistanceOhm: 0,
			gapM: -1,
			plateAreaM2: Number.NaN,
			timerBits: 8.5,
			prescaler: 0,
			samplesAveraged: 0,
			handFraction: 1.5
		});
		expect(fields(result)).toEqual([
			'resistanceOhm',
			'plateAreaM2',
			'gapM',
			'prescaler',
			'timerBits',
			'samplesAveraged',
			'handFraction'
		]);
	});

	it('rejects results that overflow double range', () => {
		// reference-values: C = eps0*eps_r*A/d grows without bound as d shrinks
		expect(fields(capacitivePlate({ ...plate, plateAreaM2: 1e300, gapM: 1e-300 }))).toEqual([
			'plateAreaM2'
		]);
	});
});
