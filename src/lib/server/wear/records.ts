// Guest counts, wear counters and maintenance (design item 11). Counts, settings and maintenance
// records are append-only; the latest row of each counts. Counters are worked out on read from the
// counted nights and the scenes that ran on them (src/lib/wear/counters.ts states the rule).
import { and, asc, desc, eq, inArray } from 'drizzle-orm';
import { groupBy } from '$lib/util/group';
import { anyUuid } from '$lib/server/db/any';
import type { Db } from '$lib/server/db/client';
import {
	guestCounts,
	maintenanceRecords,
	outputs,
	props,
	sceneCues,
	sceneResponses,
	scenes,
	showSceneExclusions,
	shows,
	standDowns,
	users,
	wearSettings
} from '$lib/server/db/schema';
import {
	groupsOf,
	wearCounter,
	type CountedNight,
	type WearCounter,
	type WearKind,
	type WearScene
} from '$lib/wear/counters';
import { figure } from '$lib/quantity';
import { notRestored } from '$lib/server/scenes/for-show';

type Reader = Pick<Db, 'select' | 'selectDistinct'>;

/** The latest guest count of each of the venue's nights (or of the given ones). */
export async function latestCounts(db: Reader, venueId: string, showIds?: string[]) {
	if (showIds && showIds.length === 0) return new Map();
	const rows = await db
		.select()
		.from(guestCounts)
		.where(
			and(
				eq(guestCounts.venueId, venueId),
				showIds ? anyUuid(guestCounts.showId, showIds) : undefined
			)
		)
		.orderBy(asc(guestCounts.at), asc(guestCounts.id));
	const latest = new Map<string, typeof guestCounts.$inferSelect>();
	for (const r of rows) latest.set(r.showId, r);
	return latest;
}

/** Every count of one night, newest first, with who entered it. */
export function countHistory(db: Reader, venueId: string, showId: string) {
	return db
		.select({
			id: guestCounts.id,
			guests: guestCounts.guests,
			groups: guestCounts.groups,
			groupSize: guestCounts.groupSize,
			at: guestCounts.at,
			by: users.name
		})
		.from(guestCounts)
		.leftJoin(users, eq(users.id, guestCounts.personId))
		.where(and(eq(guestCounts.venueId, venueId), eq(guestCounts.showId, showId)))
		.orderBy(desc(guestCounts.at), desc(guestCounts.id));
}

/** The venue's scenes that run on show nights, with their cues and responses. */
async function runningScenes(db: Reader, venueId: string) {
	const [sceneRows, cueRows, responseRows] = await Promise.all([
		db
			.select({ id: scenes.id, lengthMs: scenes.lengthMs })
			.from(scenes)
			.where(and(eq(scenes.venueId, venueId), eq(scenes.runsOnShowNights, true))),
		db
			.select({
				sceneId: sceneCues.sceneId,
				outputId: sceneCues.outputId,
				startMs: sceneCues.startMs,
				action: sceneCues.action
			})
			.from(sceneCues)
			.where(eq(sceneCues.venueId, venueId)),
		db
			.select({ sceneId: sceneResponses.sceneId, outputId: sceneResponses.outputId })
			.from(sceneResponses)
			.where(eq(sceneResponses.venueId, venueId))
	]);
	const cuesOf = groupBy(cueRows, (c) => c.sceneId);
	const responsesOf = groupBy(responseRows, (r) => r.sceneId);
	return sceneRows.map((s): WearScene => ({
		id: s.id,
		lengthMs: s.lengthMs,
		cues: cuesOf.get(s.id) ?? [],
		responses: responsesOf.get(s.id) ?? []
	}));
}

/** The venue's nights with a guest count, as a subquery (no list of ids passed). */
const countedShowIds = (db: Reader, venueId: string) =>
	db
		.selectDistinct({ id: guestCounts.showId })
		.from(guestCounts)
		.where(eq(guestCounts.venueId, venueId));

/**
 * The venue's counted nights: each night with a guest count, its groups and the scenes it ran.
 * Every read at once: the nights are picked by a subquery, not by a list of their ids.
 */
export async function countedNights(db: Reader, venueId: string): Promise<CountedNight[]> {
	const [counts, showRows, excluded, all, down] = await Promise.all([
		latestCounts(db, venueId),
		db
			.select({ id: shows.id, doorsClose: shows.doorsClose })
			.from(shows)
			.where(and(eq(shows.venueId, venueId), inArray(shows.id, countedShowIds(db, venueId)))),
		db
			.select({ showId: showSceneExclusions.showId, sceneId: showSceneExclusions.sceneId })
			.from(showSceneExclusions)
			.where(
				and(
					eq(showSceneExclusions.venueId, venueId),
					inArray(showSceneExclusions.showId, countedShowIds(db, venueId))
				)
			),
		runningScenes(db, venueId),
		db
			.select({ showId: standDowns.showId, outputId: outputs.id })
			.from(standDowns)
			.innerJoin(
				outputs,
				and(eq(outputs.propId, standDowns.propId), eq(outputs.venueId, standDowns.venueId))
			)
			.where(
				and(
					eq(standDowns.venueId, venueId),
					inArray(standDowns.showId, countedShowIds(db, venueId)),
					notRestored()
				)
			)
	]);
	if (counts.size === 0) return [];
	const excludedOf = groupBy(excluded, (e) => e.showId);
	const downOf = groupBy(down, (d) => d.showId);
	return showRows
		.filter((s) => counts.has(s.id))
		.map((s) => {
			const out = new Set((excludedOf.get(s.id) ?? []).map((e) => e.sceneId));
			return {
				showId: s.id,
				endsAt: s.doorsClose,
				groups: groupsOf(counts.get(s.id)!),
				scenes: all.filter((sc) => !out.has(sc.id)),
				idleOutputs: (downOf.get(s.id) ?? []).map((d) => d.outputId)
			};
		});
}

export interface OutputWear {
	outputId: string;
	outputName: string;
	propId: string;
	propName: string;
	relayKind: string | null;
	counter: WearCounter;
	lastMaintenance: { id: string; at: Date; note: string } | null;
}

/** The latest wear setting of each output of the venue (or of the given ones). */
async function latestSettings(db: Reader, venueId: string, outputIds?: string[]) {
	const rows = await db
		.select()
		.from(wearSettings)
		.where(
			and(
				eq(wearSettings.venueId, venueId),
				outputIds ? anyUuid(wearSettings.outputId, outputIds) : undefined
			)
		)
		.orderBy(asc(wearSettings.at), asc(wearSettings.id));
	const latest = new Map<string, typeof wearSettings.$inferSelect>();
	for (const r of rows) latest.set(r.outputId, r);
	return latest;
}

/** Wear counters of the venue's outputs that have a rated life set (or of the given outputs). */
export async function outputWear(
	db: Reader,
	venueId: string,
	outputIds?: string[]
): Promise<OutputWear[]> {
	// Most venues set no rated life: one statement then. Otherwise one more round, in which the
	// outputs and their maintenance are picked by a subquery on the wear settings (no list of ids).
	const settings = await latestSettings(db, venueId, outputIds);
	if (settings.size === 0) return [];
	const withSetting = (col: typeof outputs.id | typeof maintenanceRecords.outputId) =>
		outputIds
			? anyUuid(col, outputIds)
			: inArray(
					col,
					db
						.selectDistinct({ id: wearSettings.outputId })
						.from(wearSettings)
						.where(eq(wearSettings.venueId, venueId))
				);
	const [outs, maint, nights] = await Promise.all([
		db
			.select({
				id: outputs.id,
				name: outputs.name,
				relayKind: outputs.relayKind,
				propId: props.id,
				propName: props.name
			})
			.from(outputs)
			.innerJoin(props, and(eq(props.id, outputs.propId), eq(props.venueId, outputs.venueId)))
			.where(and(eq(outputs.venueId, venueId), withSetting(outputs.id))),
		db
			.select()
			.from(maintenanceRecords)
			.where(and(eq(maintenanceRecords.venueId, venueId), withSetting(maintenanceRecords.outputId)))
			.orderBy(asc(maintenanceRecords.at), asc(maintenanceRecords.id)),
		countedNights(db, venueId)
	]);
	const lastOf = new Map<string, (typeof maint)[number]>();
	for (const m of maint) lastOf.set(m.outputId, m);
	return outs
		.filter((o) => settings.has(o.id))
		.map((o) => {
			const s = settings.get(o.id)!;
			const last = lastOf.get(o.id) ?? null;
			return {
				outputId: o.id,
				outputName: o.name,
				propId: o.propId,
				propName: o.propName,
				relayKind: o.relayKind,
				counter: wearCounter(
					o.id,
					{ kind: s.kind as WearKind, ratedLife: s.ratedLife, interval: s.interval },
					nights,
					last?.at ?? null
				),
				lastMaintenance: last ? { id: last.id, at: last.at, note: last.note } : null
			};
		})
		.sort(
			(a, b) => a.propName.localeCompare(b.propName) || a.outputName.localeCompare(b.outputName)
		);
}

/** Outputs whose maintenance is due, each with the key of what it is due since. */
export async function dueMaintenance(db: Reader, venueId: string, outputIds?: string[]) {
	return (await outputWear(db, venueId, outputIds))
		.filter((w) => w.counter.due)
		.map((w) => ({ ...w, since: w.lastMaintenance?.id ?? 'start' }));
}

/** The latest wear setting of one output, or null. */
export async function wearSettingOf(db: Reader, venueId: string, outputId: string) {
	return (await latestSettings(db, venueId, [outputId])).get(outputId) ?? null;
}

/** Maintenance records of one output, newest first. */
export function maintenanceHistory(db: Reader, venueId: string, outputId: string) {
	return db
		.select({
			id: maintenanceRecords.id,
			note: maintenanceRecords.note,
			at: maintenanceRecords.at,
			by: users.name
		})
		.from(maintenanceRecords)
		.leftJoin(users, eq(users.id, maintenanceRecords.personId))
		.where(and(eq(maintenanceRecords.venueId, venueId), eq(maintenanceRecords.outputId, outputId)))
		.orderBy(desc(maintenanceRecords.at), desc(maintenanceRecords.id));
}

/** Work items for Tonight and the prop page: each output whose maintenance is due, in words. */
export async function maintenanceWorkItems(db: Reader, venueId: string, outputIds?: string[]) {
	if (outputIds && outputIds.length === 0) return [];
	const due = await dueMaintenance(db, venueId, outputIds);
	const amount = (n: number, unit: string) =>
		unit === 'h' ? `${figure(n, 3)} h` : `${figure(Math.round(n))} ${unit}`;
	return due.map((d) => ({
		outputId: d.outputId,
		outputName: d.outputName,
		propId: d.propId,
		propName: d.propName,
		counted: amount(d.counter.sinceMaintenance, d.counter.unit),
		interval: amount(d.counter.interval, d.counter.unit)
	}));
}
