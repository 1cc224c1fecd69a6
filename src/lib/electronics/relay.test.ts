import { describe, expect, it } from 'vitest';
import { EXTRA_LOW_VOLTAGE, checkPulse, checkRelay, type RelayInput } from './relay';
import type { Result } from './result';

function value<T>(result: Result<T>): T {
	if (!result.ok) expect.fail(JSON.stringify(result.issues));
	return result.value;
}

function codes(checks: { code: string }[]): string[] {
	return checks.map((c) => c.code);
}

// memory: a small 5 V signal relay coil is about 70 ohm; an 8-bit microcontroller pin is
// rated 40 mA absolute maximum with about 20 mA recommended
const smallRelay: RelayInput = {
	coilV: 5,
	coilOhm: 70,
	pinLimitA: 0.02,
	loadKind: 'pneumatic-valve',
	loadSupply: 'dc',
	loadV: 12,
	loadCurrentA: 0.5,
	contactRatingA: 10,
	contactRatingV: 30
};

describe('checkRelay', () => {
	it('needs a driver when the coil draws more than the pin allows', () => {
		// Ohm's law: 5 V / 70 ohm = 71.4 mA, above a 20 mA pin (memory)
		const r = value(checkRelay(smallRelay));
		expect(r.coilCurrentA).toBeCloseTo(5 / 70, 12);
		expect(r.driverNeeded).toBe(true);
		expect(r.checks.find((c) => c.code === 'driver-needed')?.level).toBe('fail');
		expect(r.passes).toBe(false);
	});

	it('draws the line at the pin limit itself', () => {
		// Ohm's law: 5 V / 200 ohm = 25 mA, just above a 20 mA pin (memory)
		expect(value(checkRelay({ ...smallRelay, coilOhm: 200 })).driverNeeded).toBe(true);
		// Ohm's law: 5 V / 250 ohm = 20 mA, exactly the 20 mA pin limit (memory)
		expect(value(checkRelay({ ...smallRelay, coilOhm: 250 })).driverNeeded).toBe(false);
	});

	it('drives a high-resistance coil straight from the pin', () => {
		// Ohm's law: 5 V / 500 ohm = 10 mA, within a 20 mA pin (memory)
		const r = value(checkRelay({ ...smallRelay, coilOhm: 500 }));
		expect(r.coilCurrentA).toBeCloseTo(0.01, 12);
		expect(r.driverNeeded).toBe(false);
		expect(r.passes).toBe(true);
	});

	it('always reminds about a flyback diode, and one across a coil load', () => {
		// common practice, no published source: flyback diode across every relay coil and DC coil load
		const valve = value(checkRelay({ ...smallRelay, coilOhm: 500 }));
		expect(valve.loadInductive).toBe(true);
		expect(codes(valve.checks)).toEqual(['flyback-coil', 'flyback-load', 'contact-derating']);
		// common practice, no published source: snubber or varistor across an AC coil load
		const acSolenoid = value(
			checkRelay({ ...smallRelay, coilOhm: 500, loadKind: 'solenoid', loadSupply: 'ac', loadV: 24 })
		);
		expect(codes(acSolenoid.checks)).toEqual(['flyback-coil', 'snubber-load', 'contact-derating']);
		// common practice, no published source: an audio trigger input is not a coil
		const audio = value(
			checkRelay({ ...smallRelay, coilOhm: 500, loadKind: 'audio-trigger', loadCurrentA: 0.01 })
		);
		expect(audio.loadInductive).toBe(false);
		expect(codes(audio.checks)).toEqual(['flyback-coil']);
	});

	it('fails a load above the contact rating', () => {
		// datasheet contact rating compared directly: 12 A > 10 A, 48 V > 30 V DC
		const r = value(checkRelay({ ...smallRelay, coilOhm: 500, loadCurrentA: 12, loadV: 48 }));
		expect(codes(r.checks)).toEqual([
			'flyback-coil',
			'flyback-load',
			'contact-current',
			'contact-voltage'
		]);
		expect(r.passes).toBe(false);
	});

	it('cautions above extra-low voltage', () => {
		// IEC 61140 extra-low voltage: up to 50 V AC and 120 V ripple-free DC (memory)
		expect(EXTRA_LOW_VOLTAGE).toEqual({ ac: 50, dc: 120 });
		const mains = value(
			checkRelay({
				...smallRelay,
				coilOhm: 500,
				loadKind: 'lamp',
				loadSupply: 'ac',
				loadV: 120,
				loadCurrentA: 1,
				contactRatingV: 250
			})
		);
		expect(codes(mains.checks)).toEqual(['flyback-coil', 'contact-derating', 'hazardous-voltage']);
		const dc48 = value(
			checkRelay({ ...smallRelay, coilOhm: 500, loadKind: 'other', loadV: 48, contactRatingV: 60 })
		);
		expect(codes(dc48.checks)).toEqual(['flyback-coil']);
	});

	it('includes the pulse checks', () => {
		// common practice, no published source: a pulse must last the part's minimum on time
		const r = value(
			checkRelay({ ...smallRelay, coilOhm: 500, pulse: { onS: 0.02, minOnS: 0.05 } })
		);
		expect(codes(r.checks)).toContain('pulse-too-short');
		expect(r.passes).toBe(false);
	});

	it('lists bad inputs, including those of the pulse', () => {
		// Ohm's law I = V/R needs R > 0
		const r = checkRelay({ ...smallRelay, coilOhm: 0, pulse: { onS: 0, minOnS: 0.05 } });
		if (r.ok) expect.fail('expected input issues');
		expect(r.issues.map((i) => i.field)).toEqual(['coilOhm', 'pulse.onS']);
	});
});

describe('checkPulse', () => {
	it('passes a pulse at or above the minimum on time', () => {
		// common practice, no published source: on time >= the part's minimum
		expect(value(checkPulse({ onS: 0.1, minOnS: 0.05 }))).toEqual([]);
		expect(value(checkPulse({ onS: 0.05, minOnS: 0.05 }))).toEqual([]);
	});

	it('fails a pulse or gap shorter than the minimum', () => {
		// common practice, no published source: a valve needs its minimum on and off times
		expect(codes(value(checkPulse({ onS: 0.02, minOnS: 0.05 })))).toEqual(['pulse-too-short']);
		expect(codes(value(checkPulse({ onS: 0.1, minOnS: 0.05, offS: 0.03, minOffS: 0.1 })))).toEqual([
			'gap-too-short'
		]);
	});

	it('rejects a zero-length pulse', () => {
		// common practice, no published source: a pulse has a positive length
		expect(checkPulse({ onS: 0, minOnS: 0.05 }).ok).toBe(false);
	});
});
