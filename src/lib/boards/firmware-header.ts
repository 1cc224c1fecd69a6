import { cIdentifier, levelTableToC } from '$lib/curves/export';
import type { BrightnessCurve } from '$lib/curves/curve';
import { plateOnController, type PlateController } from '$lib/electronics/capacitive';
import { levelTableFor } from '$lib/props/level-table';
import { shortName } from './wire';

// A C header for one controller's firmware: its timer settings, each sensor's trigger range and
// thresholds, each LED output's level table, and where to send readings. The key is never in it,
// only a placeholder to replace by hand, so the file can be shared and kept in version control.
// Pure: the controller page's download and the unit test call it alike.

export const KEY_PLACEHOLDER = 'PASTE-THE-BOARD-KEY-HERE';

export interface HeaderController extends PlateController {
	id: string;
	name: string;
	pwmBits: number;
}

export interface HeaderSensor {
	name: string;
	kind: string;
	settings: Record<string, unknown> & { kind: string };
	near: number | null;
	far: number | null;
	hysteresis: number | null;
	debounceMs: number;
	rearmMs: number;
	calibration: { direction: 'up' | 'down'; enter: number; exit: number } | null;
}

export interface HeaderOutput {
	name: string;
	kind: string;
	curve: BrightnessCurve | null;
}

export interface HeaderInput {
	venueName: string;
	controller: HeaderController;
	sensors: HeaderSensor[];
	outputs: HeaderOutput[];
	broker: { host: string; port: number };
	/** When it was made, for the comment at the top. */
	madeAt: string;
}

/** A finite number as a C double literal, to 7 significant digits. */
export function cNumber(v: number): string {
	if (!Number.isFinite(v)) throw new Error('not a finite number');
	if (Number.isInteger(v) && Math.abs(v) < 1e15) return `${v}.0`;
	const s = Number(v.toPrecision(7)).toString();
	return s.includes('.') || s.includes('e') ? s : `${s}.0`;
}

/** Text safe inside a C comment or string literal: printable ASCII only, no quote, backslash or comment end. */
function cText(text: string): string {
	return text
		.normalize('NFKD')
		.replace(/[^\x20-\x7e]/g, '')
		.replace(/["\\]/g, '')
		.replace(/\*\//g, '* /')
		.trim();
}

const macro = (name: string) => cIdentifier(name).toUpperCase();

/** Names made unique by a number suffix, in order. */
function uniqueNames(names: string[]): string[] {
	const seen = new Map<string, number>();
	return names.map((n) => {
		const k = (seen.get(n) ?? 0) + 1;
		seen.set(n, k);
		return k === 1 ? n : `${n}_${k}`;
	});
}

export function firmwareHeader(input: HeaderInput): string {
	const c = input.controller;
	const guard = `GLOAMING_${macro(c.name)}_H`;
	const out: string[] = [
		'/*',
		` * Gloaming firmware settings for ${cText(c.name) || 'a controller'} at ${cText(input.venueName)}.`,
		` * Made ${cText(input.madeAt)}; make it again after changing the controller, its sensors or outputs.`,
		' * Replace GLOAMING_BOARD_KEY with a key made on the Controllers page, and keep that copy private.',
		' */',
		`#ifndef ${guard}`,
		`#define ${guard}`,
		'',
		'#include <stdint.h>',
		'',
		'/* Sending readings (see README, "Readings from the boards"). */',
		`#define GLOAMING_BOARD_KEY "${KEY_PLACEHOLDER}"`,
		`#define GLOAMING_MQTT_HOST "${cText(input.broker.host)}"`,
		`#define GLOAMING_MQTT_PORT ${Math.trunc(input.broker.port)}`,
		`#define GLOAMING_MQTT_TOPIC "gloaming/${c.id}/readings"`,
		`#define GLOAMING_HTTP_PATH "/api/boards/readings"`,
		'',
		'/* Timer and PWM. */',
		`#define GLOAMING_TIMER_CLOCK_HZ ${cNumber(c.clockHz)}`,
		`#define GLOAMING_TIMER_PRESCALER ${Math.trunc(c.prescaler)}`,
		`#define GLOAMING_TIMER_BITS ${Math.trunc(c.timerBits)}`,
		`#define GLOAMING_PWM_BITS ${Math.trunc(c.pwmBits)}`
	];

	const sensorNames = uniqueNames(input.sensors.map((s) => macro(s.name)));
	input.sensors.forEach((s, i) => {
		const p = `GLOAMING_${sensorNames[i]}`;
		out.push('', `/* Sensor: ${cText(s.name)} (${cText(s.kind.replace(/_/g, ' '))}). */`);
		out.push(`#define ${p}_NAME "${shortName(s.name)}"`);
		if (s.calibration) {
			const cal = s.calibration;
			out.push(
				`#define ${p}_RISES ${cal.direction === 'up' ? 1 : 0}`,
				`#define ${p}_ENTER ${cNumber(cal.enter)}`,
				`#define ${p}_EXIT ${cNumber(cal.exit)}`
			);
		} else out.push(`/* Not calibrated yet: apply a capture on its sensor page for thresholds. */`);
		if (s.hysteresis !== null) out.push(`#define ${p}_HYSTERESIS ${cNumber(s.hysteresis)}`);
		if (s.near !== null) out.push(`#define ${p}_NEAR ${cNumber(s.near)}`);
		if (s.far !== null) out.push(`#define ${p}_FAR ${cNumber(s.far)}`);
		out.push(
			`#define ${p}_DEBOUNCE_MS ${Math.trunc(s.debounceMs)}`,
			`#define ${p}_REARM_MS ${Math.trunc(s.rearmMs)}`
		);
		if (s.settings.kind === 'capacitive') {
			const st = s.settings as unknown as Parameters<typeof plateOnController>[0];
			out.push(`#define ${p}_SAMPLES_AVERAGED ${Math.trunc(st.samplesAveraged)}`);
			const plate = plateOnController(st, c);
			if (plate.ok)
				out.push(
					`#define ${p}_IDLE_COUNTS_ESTIMATE ${cNumber(plate.value.counts)}`,
					`#define ${p}_UPDATE_HZ_ESTIMATE ${cNumber(plate.value.updateRateHz)}`
				);
		}
	});

	const leds = input.outputs.filter((o) => o.kind === 'led_string' && o.curve);
	const tableNames = uniqueNames(leds.map((o) => cIdentifier(`gloaming ${o.name} levels`)));
	leds.forEach((o, i) => {
		const made = levelTableFor(o.curve!, c);
		out.push('');
		if (!made.ok) {
			out.push(`/* ${cText(o.name)}: no level table, its curve has problems. */`);
			return;
		}
		// The level table exporter's own array, without its include (already above).
		const body = levelTableToC(made.table, tableNames[i])
			.replace('#include <stdint.h>\n\n', '')
			.trimEnd();
		out.push(body);
	});

	out.push('', `#endif /* ${guard} */`, '');
	return out.join('\n');
}

/** A file name for the header: the controller's name as an identifier. */
export function headerFileName(controllerName: string): string {
	return `gloaming_${cIdentifier(controllerName)}.h`;
}
