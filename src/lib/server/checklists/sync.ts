import { and, asc, eq, gt, inArray, lt, sql } from 'drizzle-orm';
import { checkScene, needsStrobeSignage } from '$lib/scenes/checks';
import { DEFAULT_VENUE_ITEMS, generateChecklist, type CheckSpec } from '$lib/checklists/generate';
import type { Db } from '$lib/server/db/client';
import { checks, rooms, shows, signOffs, venueSafetyItems, venues } from '$lib/server/db/schema';
import { loadNight } from '$lib/server/scenes/night';
import { luminanceThroughCurves } from '$lib/server/scenes/model';
import { lockShow } from './record';
import { openChanges } from '$lib/server/changes/records';
import { dueMaintenance } from '$lib/server/wear/records';
import { figure } from '$lib/quantity';

type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];
type Writer = Db | Tx;

/** Rows per INSERT or UPDATE: 15 parameters a check keeps a statement far below PostgreSQL's 65,535. */
export const CHUNK = 500;

function chunks<T>(rows: T[], size = CHUNK): T[][] {
	const out: T[][] = [];
	for (let i = 0; i < rows.length; i += size) out.push(rows.slice(i, i + size));
	return out;
}

/** Give a venue that never had a safety list the usual five. Returns whether it made them. */
async function ensureVenueItems(db: Writer, venueId: string): Promise<boolean> {
	const [any] = await db
		.select({ id: venueSafetyItems.id })
		.from(venueSafetyItems)
		.where(eq(venueSafetyItems.venueId, venueId))
		.limit(1);
	if (any) return false;
	return db.transaction(async (tx) => {
		await tx.execute(sql`select pg_advisory_xact_lock(hashtext(${'safety:' + venueId}))`);
		const [again] = await tx
			.select({ id: venueSafetyItems.id })
			.from(venueSafetyItems)
			.where(eq(venueSafetyItems.venueId, venueId))
			.limit(1);
		if (again) return false;
		await tx
			.insert(venueSafetyItems)
			.values(DEFAULT_VENUE_ITEMS.map((label, i) => ({ venueId, label, position: i + 1 })));
		return true;
	});
}

/** The venue's safety items; a venue that never had a list starts with the usual five. */
export async function venueItems(db: Writer, venueId: string, includeRetired = false) {
	const read = () =>
		db
			.select()
			.from(venueSafetyItems)
			.where(eq(venueSafetyItems.venueId, venueId))
			.orderBy(asc(venueSafetyItems.position), asc(venueSafetyItems.createdAt));
	let rows = await read();
	if (rows.length === 0 && (await ensureVenueItems(db, venueId))) rows = await read();
	return includeRetired ? rows : rows.filter((r) => r.active);
}

/** What the generator needs for one show, read from the scenes that run that night. */
export async function checklistSpecs(
	db: Writer,
	venueId: string,
	showId: string
): Promise<CheckSpec[]> {
	const [items, night, roomRows, show] = await Promise.all([
		venueItems(db, venueId),
		loadNight(db, venueId, showId),
		db
			.select({ id: rooms.id, name: rooms.name, position: rooms.position })
			.from(rooms)
			.where(eq(rooms.venueId, venueId)),
		db
			.select({ id: shows.id, doorsOpen: shows.doorsOpen })
			.from(shows)
			.where(and(eq(shows.id, showId), eq(shows.venueId, venueId)))
			.then((r) => r[0])
	]);
	const [changes, due] = await Promise.all([
		show ? openChanges(db, venueId, show) : [],
		dueMaintenance(db, venueId)
	]);
	const strobeSceneRooms: (string | null)[] = [];
	for (const s of night.scenes) {
		const findings = checkScene(s.scene, s.outputs, {
			luminance: luminanceThroughCurves(s.outputRows)
		});
		if (needsStrobeSignage(findings)) strobeSceneRooms.push(s.roomId);
	}
	return generateChecklist({
		rooms: roomRows,
		props: night.props.map((p) => ({ id: p.id, name: p.name, roomId: p.roomId })),
		sensors: night.sensors.map((s) => ({
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
		outputs: night.outputs.map((o) => ({
			id: o.id,
			propId: o.propId,
			name: o.name,
			kind: o.kind,
			relayKind: o.relayKind,
			safeState: o.safeState
		})),
		strobeSceneRooms,
		venueItems: items.map((i) => ({ id: i.id, label: i.label })),
		retests: changes.map((c) => ({
			propId: c.propId,
			changeId: c.id,
			line: `${c.partName}: ${c.summary}, because “${c.reason.replace(/\s+/g, ' ')}”.`
		})),
		maintenance: due.map((d) => ({
			propId: d.propId,
			outputId: d.outputId,
			since: d.since,
			line: maintenanceLine(d)
		}))
	});
}

/** "Drop: maintenance due (12,000 of 10,000 cycles since the last)". */
export function maintenanceLine(d: {
	propName: string;
	outputName: string;
	counter: { sinceMaintenance: number; interval: number; unit: string };
}) {
	const c = d.counter;
	return `${d.propName}: ${d.outputName} maintenance due (${figure(c.sinceMaintenance, 3)} of ${figure(c.interval, 3)} ${c.unit} since the last)`;
}

type StoredCheck = typeof checks.$inferSelect;

/** JSON with keys in one order: jsonb hands objects back with its own key order. */
function canonical(v: unknown): string {
	if (Array.isArray(v)) return `[${v.map(canonical).join(',')}]`;
	if (v && typeof v === 'object')
		return `{${Object.keys(v)
			.filter((k) => (v as Record<string, unknown>)[k] !== undefined)
			.sort()
			.map((k) => `${JSON.stringify(k)}:${canonical((v as Record<string, unknown>)[k])}`)
			.join(',')}}`;
	return JSON.stringify(v) ?? 'null';
}

const sameCheck = (row: StoredCheck, spec: CheckSpec) =>
	row.removedAt === null &&
	row.label === spec.label &&
	row.detail === spec.detail &&
	row.roomId === spec.roomId &&
	row.sortKey === spec.sortKey &&
	row.required === spec.required &&
	row.kind === spec.kind &&
	row.propId === spec.propId &&
	row.sensorId === spec.sensorId &&
	row.outputId === spec.outputId &&
	row.safetyItemId === spec.safetyItemId &&
	canonical(row.expected) === canonical(spec.expected);

/**
 * Regenerate one show's checklist inside a transaction that holds the show's row lock. Checks are
 * matched by key, so results already recorded stay with their check; only lines that changed are
 * written, in chunks; lines no longer generated are marked removed, never deleted. The show then
 * records the inputs number it was generated at. A signed-off night is frozen as it was signed.
 */
export async function regenerateLocked(tx: Tx, venueId: string, showId: string) {
	const [signed] = await tx
		.select({ id: signOffs.id })
		.from(signOffs)
		.where(eq(signOffs.showId, showId));
	if (signed) return;
	// Read the number before the inputs: a change committed after this is at a higher number, so
	// the next reader sees the list as stale even if these reads missed it. Making a venue's first
	// safety list raises the number too (its own trigger), so it is read again after.
	const readVersion = () =>
		tx
			.select({ version: venues.checklistInputsVersion })
			.from(venues)
			.where(eq(venues.id, venueId))
			.then((r) => r[0]);
	let venue = await readVersion();
	if (!venue) return;
	if (await ensureVenueItems(tx, venueId)) venue = await readVersion();
	if (!venue) return;
	const [specs, stored] = await Promise.all([
		checklistSpecs(tx, venueId, showId),
		tx
			.select()
			.from(checks)
			.where(and(eq(checks.showId, showId), eq(checks.venueId, venueId)))
	]);
	const byKey = new Map(stored.map((c) => [c.key, c]));
	const wanted = new Set(specs.map((s) => s.key));
	const changed = specs.filter((s) => {
		const row = byKey.get(s.key);
		return !row || !sameCheck(row, s);
	});
	for (const part of chunks(changed)) {
		await tx
			.insert(checks)
			.values(part.map((s) => ({ ...s, venueId, showId, removedAt: null })))
			.onConflictDoUpdate({
				target: [checks.showId, checks.key],
				set: {
					label: sql`excluded.label`,
					detail: sql`excluded.detail`,
					expected: sql`excluded.expected`,
					roomId: sql`excluded.room_id`,
					sortKey: sql`excluded.sort_key`,
					required: sql`excluded.required`,
					propId: sql`excluded.prop_id`,
					sensorId: sql`excluded.sensor_id`,
					outputId: sql`excluded.output_id`,
					safetyItemId: sql`excluded.safety_item_id`,
					removedAt: null
				}
			});
	}
	const gone = stored.filter((c) => c.removedAt === null && !wanted.has(c.key)).map((c) => c.id);
	const now = new Date();
	for (const part of chunks(gone, 5000)) {
		await tx
			.update(checks)
			.set({ removedAt: now })
			.where(and(eq(checks.venueId, venueId), inArray(checks.id, part)));
	}
	await tx
		.update(shows)
		.set({ checklistVersion: venue.version })
		.where(and(eq(shows.id, showId), eq(shows.venueId, venueId)));
}

/** Regenerate a show's checklist now, whether or not its inputs changed (tests, repairs). */
export async function syncChecklist(db: Db, venueId: string, showId: string) {
	await db.transaction(async (tx) => {
		if (await lockShow(tx, venueId, showId)) await regenerateLocked(tx, venueId, showId);
	});
}

/** Whether a show's stored checklist is older than its inputs (and the night is not signed off). */
export function checklistStale(row: {
	checklistVersion: number | null;
	inputsVersion: number;
	signed: boolean;
}) {
	return !row.signed && row.checklistVersion !== row.inputsVersion;
}

export const freshness = (db: Pick<Db, 'select'>, venueId: string, showId: string) =>
	db
		.select({
			checklistVersion: shows.checklistVersion,
			activity: shows.checklistActivity,
			inputsVersion: venues.checklistInputsVersion,
			signed: sql<boolean>`exists (select 1 from ${signOffs} where ${signOffs.showId} = ${shows.id})`
		})
		.from(shows)
		.innerJoin(venues, eq(venues.id, shows.venueId))
		.where(and(eq(shows.id, showId), eq(shows.venueId, venueId)));

/**
 * Make sure a show's checklist matches its inputs: one read when it does, and otherwise a single
 * regeneration under the show's lock (a second reader waiting on the lock finds it done). Returns
 * whether it regenerated.
 */
export async function ensureChecklist(db: Db, venueId: string, showId: string): Promise<boolean> {
	const [row] = await freshness(db, venueId, showId);
	if (!row || !checklistStale(row)) return false;
	return db.transaction(async (tx) => {
		if (!(await lockShow(tx, venueId, showId))) return false;
		return refreshLocked(tx, venueId, showId);
	});
}

/** Regenerate a stale checklist inside a transaction that already holds the show's lock. */
export async function refreshLocked(tx: Tx, venueId: string, showId: string) {
	const [row] = await freshness(tx, venueId, showId);
	if (!row || !checklistStale(row)) return false;
	await regenerateLocked(tx, venueId, showId);
	return true;
}

/**
 * Run a read that depends on the checklist together with the freshness check, so a fresh
 * checklist costs no extra round trip; when it was stale, regenerate and read again.
 */
export async function withFreshChecklist<T>(
	db: Db,
	venueId: string,
	showId: string,
	read: () => Promise<T>
): Promise<T> {
	const [[row], first] = await Promise.all([freshness(db, venueId, showId), read()]);
	if (!row || !checklistStale(row)) return first;
	await ensureChecklist(db, venueId, showId);
	return read();
}

/**
 * Regenerate the stale checklists of shows starting within the next `hours`, so the crew's first
 * read on the night finds them ready. Run by the once-a-minute sweep; a few shows per run.
 */
export async function refreshUpcomingChecklists(db: Db, now: Date, hours = 36, limit = 20) {
	const due = await db
		.select({ id: shows.id, venueId: shows.venueId })
		.from(shows)
		.innerJoin(venues, eq(venues.id, shows.venueId))
		.where(
			and(
				eq(shows.status, 'scheduled'),
				gt(shows.doorsClose, now),
				lt(shows.crewCall, new Date(now.getTime() + hours * 3_600_000)),
				sql`${shows.checklistVersion} is distinct from ${venues.checklistInputsVersion}`,
				sql`not exists (select 1 from ${signOffs} where ${signOffs.showId} = ${shows.id})`
			)
		)
		.orderBy(asc(shows.crewCall))
		.limit(limit);
	for (const s of due) await ensureChecklist(db, s.venueId, s.id);
	return due.length;
}
