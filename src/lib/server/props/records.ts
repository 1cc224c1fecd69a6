import { and, asc, eq } from 'drizzle-orm';
import type { Db } from '$lib/server/db/client';
import { outputs, propFiles, props, sensors } from '$lib/server/db/schema';
import type { OutputInput } from '$lib/schemas/output';
import type { SensorInput } from '$lib/schemas/sensor';

export function sensorValues(s: SensorInput) {
	return {
		kind: s.settings.kind,
		name: s.name,
		settings: s.settings,
		near: s.range.near,
		far: s.range.far,
		hysteresis: s.range.hysteresis,
		debounceMs: s.range.debounceMs,
		rearmMs: s.range.rearmMs
	};
}

export function outputValues(o: OutputInput) {
	return {
		kind: o.settings.kind,
		relayKind: o.settings.kind === 'relay' ? o.settings.relayKind : null,
		name: o.name,
		settings: o.settings,
		safeState: o.safeState
	};
}

/** Saved settings as dotted form values, for an edit form. */
export function flatValues(row: Record<string, unknown>, nested: string[]) {
	const out: Record<string, string> = {};
	for (const [k, v] of Object.entries(row)) {
		if (nested.includes(k) && v && typeof v === 'object') {
			for (const [sk, sv] of Object.entries(v as Record<string, unknown>))
				out[`${k}.${sk}`] =
					sv === null || sv === undefined || sv === false ? '' : sv === true ? 'on' : String(sv);
		} else if (v !== null && v !== undefined && typeof v !== 'object') out[k] = String(v);
	}
	return out;
}

export function sensorFormValues(s: typeof sensors.$inferSelect) {
	const flat = flatValues({ name: s.name, settings: s.settings }, ['settings']);
	for (const k of ['near', 'far', 'hysteresis', 'debounceMs', 'rearmMs'] as const)
		flat[`range.${k}`] = s[k] === null ? '' : String(s[k]);
	return flat;
}

export async function propChildren(db: Db, venueId: string, propId: string) {
	const [s, o, f] = await Promise.all([
		db
			.select()
			.from(sensors)
			.where(and(eq(sensors.venueId, venueId), eq(sensors.propId, propId)))
			.orderBy(asc(sensors.createdAt)),
		db
			.select()
			.from(outputs)
			.where(and(eq(outputs.venueId, venueId), eq(outputs.propId, propId)))
			.orderBy(asc(outputs.createdAt)),
		db
			.select()
			.from(propFiles)
			.where(and(eq(propFiles.venueId, venueId), eq(propFiles.propId, propId)))
			.orderBy(asc(propFiles.uploadedAt))
	]);
	return { sensors: s, outputs: o, files: f };
}

export async function touchProp(db: Db, venueId: string, propId: string) {
	await db
		.update(props)
		.set({ updatedAt: new Date() })
		.where(and(eq(props.id, propId), eq(props.venueId, venueId)));
}
