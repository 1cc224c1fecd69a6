import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { calibrate } from '$lib/calibration/calibrate';
import { plateOnController } from '$lib/electronics/capacitive';
import { levelTableFor } from '$lib/props/level-table';
import {
	KEY_PLACEHOLDER,
	cNumber,
	firmwareHeader,
	headerFileName,
	type HeaderInput
} from './firmware-header';

const plate = {
	kind: 'capacitive',
	resistanceOhm: 1_000_000,
	plateAreaCm2: 150,
	gapMm: 15,
	strayPf: 12,
	samplesAveraged: 8,
	readingNoiseCounts: 2,
	handFraction: 0.5
};
const cal = calibrate({
	idle: { count: 600, mean: 1480, sigma: 3 },
	present: { count: 300, mean: 1560, sigma: 6 },
	updateRateHz: 40
});
const controller = {
	id: '2b7c4c2e-9a53-4c61-8f0e-5d1b8c6a7e10',
	name: 'Lantern board A',
	supplyV: 5,
	clockHz: 16_000_000,
	timerBits: 16,
	pwmBits: 8,
	prescaler: 64,
	referenceV: 1.1,
	rechargeUs: 10,
	loopOverheadMs: 1
};
const input: HeaderInput = {
	venueName: 'Hollow Pines Trail',
	controller,
	sensors: [
		{
			name: 'Well-lip plate',
			kind: 'capacitive',
			settings: plate,
			near: cal.depth.near,
			far: cal.depth.far,
			hysteresis: Math.abs(cal.enter - cal.exit),
			debounceMs: 40,
			rearmMs: 1500,
			calibration: { direction: cal.direction, enter: cal.enter, exit: cal.exit }
		},
		{
			name: 'Threshold beam',
			kind: 'break_beam',
			settings: { kind: 'break_beam', beamLengthM: 1.8 },
			near: null,
			far: null,
			hysteresis: null,
			debounceMs: 20,
			rearmMs: 8000,
			calibration: null
		}
	],
	outputs: [
		{ name: 'Warm lanterns', kind: 'led_string', curve: { kind: 'cie' } },
		{ name: 'Jar glow', kind: 'led_string', curve: { kind: 'gamma', exponent: 2.2 } },
		{ name: 'Drop valve', kind: 'relay', curve: null }
	],
	broker: { host: 'boards.hollow-pines.test', port: 1883 },
	madeAt: '2027-10-02 18:30'
};
const header = firmwareHeader(input);

/** The value of a #define in the header, as written. */
function define(name: string): string | undefined {
	return header.match(new RegExp(`^#define ${name} (.+)$`, 'm'))?.[1];
}

/** The numbers of a static array in the header. */
function array(name: string): number[] {
	const m = header.match(new RegExp(`${name}\\[\\d+\\] = \\{([^}]*)\\}`));
	return m ? m[1].split(',').map((s) => Number(s.trim())) : [];
}

describe('firmwareHeader', () => {
	it('carries the thresholds and trigger range the calibration made', () => {
		// calibrate() is the prop's own threshold maths; the header must carry its numbers
		expect(Number(define('GLOAMING_WELL_LIP_PLATE_ENTER'))).toBeCloseTo(cal.enter, 3);
		expect(Number(define('GLOAMING_WELL_LIP_PLATE_EXIT'))).toBeCloseTo(cal.exit, 3);
		expect(Number(define('GLOAMING_WELL_LIP_PLATE_HYSTERESIS'))).toBeCloseTo(
			Math.abs(cal.enter - cal.exit),
			3
		);
		expect(define('GLOAMING_WELL_LIP_PLATE_RISES')).toBe(cal.direction === 'up' ? '1' : '0');
		expect(define('GLOAMING_WELL_LIP_PLATE_NAME')).toBe('"well-lip-plate"');
		expect(define('GLOAMING_WELL_LIP_PLATE_SAMPLES_AVERAGED')).toBe('8');
		expect(define('GLOAMING_WELL_LIP_PLATE_DEBOUNCE_MS')).toBe('40');
		// An uncalibrated sensor gets no made-up thresholds.
		expect(define('GLOAMING_THRESHOLD_BEAM_ENTER')).toBeUndefined();
		expect(define('GLOAMING_THRESHOLD_BEAM_REARM_MS')).toBe('8000');
	});

	it('carries the plate estimate and timer settings of the plate maths', () => {
		const maths = plateOnController(plate, controller);
		expect(maths.ok).toBe(true);
		if (!maths.ok) return;
		// RC discharge t = R C ln(V0/Vref), counts = t f / prescaler (plateOnController)
		expect(Number(define('GLOAMING_WELL_LIP_PLATE_IDLE_COUNTS_ESTIMATE'))).toBeCloseTo(
			maths.value.counts,
			3
		);
		expect(Number(define('GLOAMING_WELL_LIP_PLATE_UPDATE_HZ_ESTIMATE'))).toBeCloseTo(
			maths.value.updateRateHz,
			3
		);
		expect(define('GLOAMING_TIMER_PRESCALER')).toBe('64');
		expect(define('GLOAMING_TIMER_BITS')).toBe('16');
		expect(define('GLOAMING_PWM_BITS')).toBe('8');
	});

	it('carries each LED output’s level table, and none for a relay', () => {
		const cie = levelTableFor({ kind: 'cie' }, controller);
		const gamma = levelTableFor({ kind: 'gamma', exponent: 2.2 }, controller);
		if (!cie.ok || !gamma.ok) throw new Error('the curves should make tables');
		// levelTableFor is the output's own level-table maths (CIE 1976 L* and gamma 2.2 curves)
		expect(array('gloaming_warm_lanterns_levels')).toEqual(cie.table.counts);
		expect(array('gloaming_jar_glow_levels')).toEqual(gamma.table.counts);
		expect(header).not.toMatch(/drop_valve/);
	});

	it('says where to send readings, with a placeholder for the key', () => {
		expect(define('GLOAMING_MQTT_HOST')).toBe('"boards.hollow-pines.test"');
		expect(define('GLOAMING_MQTT_PORT')).toBe('1883');
		expect(define('GLOAMING_MQTT_TOPIC')).toBe(`"gloaming/${controller.id}/readings"`);
		expect(define('GLOAMING_BOARD_KEY')).toBe(`"${KEY_PLACEHOLDER}"`);
		expect(header).not.toMatch(/glb_/);
		expect(headerFileName('Lantern board A')).toBe('gloaming_lantern_board_a.h');
	});

	it('keeps names that would break C out of strings and comments', () => {
		const odd = firmwareHeader({
			...input,
			venueName: 'The "Quote" */ Hall \\',
			controller: { ...controller, name: 'Board */ "x"' }
		});
		expect(odd).not.toMatch(/\*\/ Hall/);
		expect(odd).not.toMatch(/"x"/);
		expect(cNumber(1480)).toBe('1480.0');
		expect(cNumber(0.000123456789)).toBe('0.0001234568');
	});
});

function findCompiler(): string | null {
	for (const cc of ['gcc', 'cc', 'clang']) {
		try {
			execFileSync(cc, ['--version'], { stdio: 'ignore' });
			return cc;
		} catch {
			// try the next one
		}
	}
	return null;
}
const compiler = findCompiler();

describe.skipIf(compiler === null)('firmwareHeader with a C compiler', () => {
	it('compiles cleanly as C11 and its values are what the maths says', () => {
		// ISO/IEC 9899:2011, checked by the system compiler in strict mode
		const dir = mkdtempSync(join(tmpdir(), 'gloaming-header-'));
		try {
			writeFileSync(join(dir, 'gloaming.h'), header);
			writeFileSync(
				join(dir, 'use.c'),
				[
					'#include "gloaming.h"',
					'#include "gloaming.h"',
					'_Static_assert(GLOAMING_TIMER_PRESCALER == 64, "prescaler");',
					'int use(void);',
					'int use(void) {',
					'\treturn gloaming_warm_lanterns_levels[255] + gloaming_jar_glow_levels[0]',
					'\t\t+ (int)sizeof GLOAMING_BOARD_KEY + (int)sizeof GLOAMING_MQTT_TOPIC',
					'\t\t+ (GLOAMING_WELL_LIP_PLATE_ENTER > GLOAMING_WELL_LIP_PLATE_EXIT);',
					'}',
					''
				].join('\n')
			);
			const run = () =>
				execFileSync(
					compiler!,
					['-std=c11', '-pedantic-errors', '-Wall', '-Wextra', '-Werror', '-fsyntax-only', 'use.c'],
					{ cwd: dir, stdio: 'pipe' }
				);
			expect(run).not.toThrow();
		} finally {
			rmSync(dir, { recursive: true, force: true });
		}
	});
});
