import { and, asc, eq, inArray, isNull, notInArray, sql } from 'drizzle-orm';
import { checkScene, needsStrobeSignage } from '$lib/scenes/checks';
import { DEFAULT_VENUE_ITEMS, generateChecklist, type CheckSpec } from '$lib/checklists/generate';
import type { Db } from '$lib/server/db/client';
import {
	checks,
	outputs,
	props,
	rooms,
	sensors,
	signOffs,
	venueSafetyItems
} from '$lib/server/db/schema';
import { scenesForShow } from '$lib/server/scenes/for-show';
import { loadScene, luminanceThroughCurves } from '$lib/server/scenes/model';

/** The venue's safety items; a venue that never had a list starts with the usual five. */
export async function venueItems(db: Db, venueId: string, includeRetired = false) {
	let rows = await db
		.select()
		.from(venueSafetyItems)
		.where(eq(venueSafetyItems.venueId, venueId))
		.orderBy(asc(venueSafetyItems.position), asc(venueSafetyItems.createdAt));
	if (rows.length === 0) {
		rows = await db.transaction(async (tx) => {
			await tx.execute(sql`select pg_advisory_xact_lock(hashtext(${'safety:' + venueId}))`);
			const again = await tx
				.select()
				.from(venueSafetyItems)
				.where(eq(venueSafetyItems.venueId, venueId));
			if (again.length) return again;
			return tx
				.insert(venueSafetyItems)
				.values(DEFAULT_VENUE_ITEMS.map((label, i) => ({ venueId, label, position: i + 1 })))
				.returning();
		});
		rows.sort((a, b) => a.position - b.position);
	}
	return includeRetired ? rows : rows.filter((r) => r.active);
}

/** What the generator needs for one show, read from the scenes that run that night. */
export async function checklistSpecs(
	db: Db,
	venueId: string,
	showId: string
): Promise<CheckSpec[]> {
	const night = await scenesForShow(db, venueId, showId);
	const propIds = [...new Set(night.flatMap((s) => s.propIds))];
	const [roomRows, propRows, sensorRows, outputRows, items] = await Promise.all([
		db
			.select({ id: rooms.id, name: rooms.name, position: rooms.position })
			.from(rooms)
			.where(eq(rooms.venueId, venueId)),
		propIds.length
			? db
					.select({ id: props.id, name: props.name, roomId: props.roomId })
					.from(props)
					.where(and(eq(props.venueId, venueId), inArray(props.id, propIds)))
			: [],
		propIds.length
			? db
					.select()
					.from(sensors)
					.where(and(eq(sensors.venueId, venueId), inArray(sensors.propId, propIds)))
					.orderBy(asc(sensors.name))
			: [],
		propIds.length
			? db
					.select()
					.from(outputs)
					.where(and(eq(outputs.venueId, venueId), inArray(outputs.propId, propIds)))
					.orderBy(asc(outputs.name))
			: [],
		venueItems(db, venueId)
	]);
	const strobeSceneRooms: (string | null)[] = [];
	for (const s of night) {
		const loaded = await loadScene(db, venueId, s.id);
		if (!loaded) continue;
		const findings = checkScene(loaded.scene, loaded.outputs, {
			luminance: luminanceThroughCurves(loaded.outputRows)
		});
		if (needsStrobeSignage(findings)) strobeSceneRooms.push(s.roomId);
	}
	return generateChecklist({
		rooms: roomRows,
		props: propRows,
		sensors: sensorRows.map((s) => ({
			id: s.id,
			propId: s.propId,
			name: s.name,
			kind: s.kind,
			calibration: s.calibration
				? {
						direction: s.calibration.direction,
						enter: s.calibration.enter,
						exit: s.calibration.exit,
						baselineLow: s.calibration.baselineLow,
						baselineHigh: s.calibration.baselineHigh
					}
				: null
		})),
		outputs: outputRows.map((o) => ({
			id: o.id,
			propId: o.propId,
			name: o.name,
			kind: o.kind,
			relayKind: o.relayKind,
			safeState: o.safeState
		})),
		strobeSceneRooms,
		venueItems: items.map((i) => ({ id: i.id, label: i.label }))
	});
}

/**
 * Bring a show's stored checklist in line with its scenes. Checks are matched by key, so results
 * already recorded stay with their check; lines no longer generated are marked removed, never
 * deleted. A signed-off night is frozen as it was signed.
 */
export async function syncChecklist(
	db: Db,
	venueId: string,
	showId: string,
	options: { onlyIfEmpty?: boolean } = {}
) {
	const [signed] = await db
		.select({ id: signOffs.id })
		.from(signOffs)
		.where(eq(signOffs.showId, showId));
	if (signed) return;
	if (options.onlyIfEmpty) {
		// Summaries (Tonight) only need a list to exist; the show and checklist pages refresh it.
		const [any] = await db
			.select({ id: checks.id })
			.from(checks)
			.where(eq(checks.showId, showId))
			.limit(1);
		if (any) return;
	}
	const specs = await checklistSpecs(db, venueId, showId);
	if (specs.length) {
		await db
			.insert(checks)
			.values(specs.map((s) => ({ ...s, venueId, showId, removedAt: null })))
			.onConflictDoUpdate({
				target: [checks.showId, checks.key],
				set: {
					label: sql`excluded.label`,
					detail: sql`excluded.detail`,
					expected: sql`excluded.expected`,
					roomId: sql`excluded.room_id`,
					sortKey: sql`excluded.sort_key`,
					required: sql`excluded.required`,
					removedAt: null
				}
			});
	}
	await db
		.update(checks)
		.set({ removedAt: new Date() })
		.where(
			and(
				eq(checks.showId, showId),
				eq(checks.venueId, venueId),
				isNull(checks.removedAt),
				specs.length
					? notInArray(
							checks.key,
							specs.map((s) => s.key)
						)
					: undefined
			)
		);
}
