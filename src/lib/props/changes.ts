import { figure, formatQuantity, unitKind } from '../quantity';
import { RANGE_FIELDS, SENSOR_FIELDS } from '../components/props/sensor-defaults';
import { OUTPUT_FIELDS } from '../components/props/output-defaults';
import {
	OUTPUT_KIND_LABELS,
	SAFE_STATE_LABELS,
	SENSOR_KIND_LABELS,
	type OutputKind,
	type SafeState,
	type SensorKind
} from '../schemas/prop-words';
import type { BrightnessCurve } from '../curves/curve';

/**
 * What a save changes on a prop's sensor or output, field by field in people's words, for the change
 * record kept when a prop that has been on a signed-off night is changed. Pure, for server and tests.
 */
export interface Difference {
	label: string;
	before: string;
	after: string;
}

interface FieldWords {
	name: string;
	label: string;
	unit?: string;
	choices?: [string, string][];
}

/** A stored value as people read it: rounded figures with their unit, choices by their label. */
function words(field: FieldWords, v: unknown): string {
	if (v === null || v === undefined || v === '') {
		const blank = field.choices?.find(([k]) => k === '');
		return blank ? blank[1] : 'not set';
	}
	if (typeof v === 'boolean') {
		const on = field.choices?.find(([k]) => (v ? k !== '' : k === ''));
		return on ? on[1] : v ? 'yes' : 'no';
	}
	const choice = field.choices?.find(([k]) => k === String(v));
	if (choice) return choice[1];
	if (typeof v === 'number') {
		const { kind, scale } = unitKind(field.unit);
		if (kind !== 'plain') return formatQuantity(v * scale, kind);
		const unit = field.unit && !/^\d/.test(field.unit) ? ` ${field.unit}` : '';
		return `${figure(v)}${unit}`;
	}
	return String(v);
}

function same(a: unknown, b: unknown) {
	const blank = (v: unknown) => v === null || v === undefined || v === '' || v === false;
	if (blank(a) && blank(b)) return true;
	return typeof a === 'number' && typeof b === 'number' ? a === b : String(a) === String(b);
}

export function differences(fields: FieldWords[], was: object, now: object): Difference[] {
	const before = was as Record<string, unknown>;
	const after = now as Record<string, unknown>;
	return fields
		.filter((f) => !same(before[f.name], after[f.name]))
		.map((f) => ({
			label: f.label,
			before: words(f, before[f.name]),
			after: words(f, after[f.name])
		}));
}

/** "Gap to the hand 20 mm → 12 mm; Readings averaged 8 → 4". Empty when nothing changed. */
export function summarise(diffs: Difference[]): string {
	return diffs.map((d) => `${d.label} ${d.before} → ${d.after}`).join('; ');
}

export interface SensorState {
	name: string;
	kind: SensorKind;
	settings: Record<string, unknown>;
	near: number | null;
	far: number | null;
	hysteresis: number | null;
	debounceMs: number | null;
	rearmMs: number | null;
}

/** The part of a sensor row a change record keeps as its old or new value. */
export function sensorState(s: SensorState): Record<string, unknown> {
	return {
		name: s.name,
		kind: s.kind,
		settings: s.settings,
		near: s.near,
		far: s.far,
		hysteresis: s.hysteresis,
		debounceMs: s.debounceMs,
		rearmMs: s.rearmMs
	};
}

export function sensorDifferences(before: SensorState, after: SensorState): Difference[] {
	const head: Difference[] = [];
	if (before.name !== after.name)
		head.push({ label: 'Name', before: before.name, after: after.name });
	if (before.kind !== after.kind)
		return [
			...head,
			{
				label: 'Kind',
				before: SENSOR_KIND_LABELS[before.kind],
				after: SENSOR_KIND_LABELS[after.kind]
			},
			...differences(RANGE_FIELDS, before, after)
		];
	return [
		...head,
		...differences(SENSOR_FIELDS[after.kind], before.settings, after.settings),
		...differences(RANGE_FIELDS, before, after)
	];
}

export interface OutputState {
	name: string;
	kind: OutputKind;
	safeState: SafeState;
	settings: Record<string, unknown>;
}

export function outputState(o: OutputState): Record<string, unknown> {
	return { name: o.name, kind: o.kind, safeState: o.safeState, settings: o.settings };
}

export function outputDifferences(before: OutputState, after: OutputState): Difference[] {
	const out: Difference[] = [];
	if (before.name !== after.name)
		out.push({ label: 'Name', before: before.name, after: after.name });
	if (before.kind !== after.kind)
		out.push({
			label: 'Kind',
			before: OUTPUT_KIND_LABELS[before.kind],
			after: OUTPUT_KIND_LABELS[after.kind]
		});
	if (before.safeState !== after.safeState)
		out.push({
			label: 'Safe state',
			before: SAFE_STATE_LABELS[before.safeState],
			after: SAFE_STATE_LABELS[after.safeState]
		});
	if (before.kind === after.kind)
		out.push(...differences(OUTPUT_FIELDS[after.kind], before.settings, after.settings));
	return out;
}

export function curveWords(curve: BrightnessCurve | null): string {
	if (!curve) return 'none';
	switch (curve.kind) {
		case 'linear':
			return 'linear';
		case 'cie':
			return 'CIE lightness';
		case 'gamma':
			return `gamma ${figure(curve.exponent, 3)}`;
		case 'points':
			return `${curve.points.length} drawn points`;
	}
}

export function curveDifferences(
	before: BrightnessCurve | null,
	after: BrightnessCurve
): Difference[] {
	const was = curveWords(before);
	const now = curveWords(after);
	const samePoints =
		before?.kind === 'points' &&
		after.kind === 'points' &&
		JSON.stringify(before.points) === JSON.stringify(after.points);
	if (was === now && (after.kind !== 'points' || samePoints)) return [];
	return [{ label: 'Brightness curve', before: was, after: now === was ? `${now}, redrawn` : now }];
}
