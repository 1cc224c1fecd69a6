// The close-of-night checklist: generated from the night's props (src/lib/checklists/close.ts) and
// the maintenance due, stored by key in close_checks so ticks stay with their line, worked by the
// night's crew and closed by a show manager's close sign-off. Ticks and the sign-off are
// append-only; a signed close is frozen as it was signed.
import { and, asc, eq, sql } from 'drizzle-orm';
import { anyUuid } from '$lib/server/db/any';
import type { Db } from '$lib/server/db/client';
import {
	closeChecks,
	closeResults,
	closeSignOffs,
	guestCounts,
	rooms,
	users
} from '$lib/server/db/schema';
import { generateCloseChecklist, type CloseSpec } from '$lib/checklists/close';
import { loadNight } from '$lib/server/scenes/night';
import { dueMaintenance } from '$lib/server/wear/records';
import { lockShow } from './record';
import { maintenanceLine } from './sync';

type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];
type Reader = Pick<Db, 'select' | 'selectDistinct'>;

export async function closeSpecs(
	db: Reader,
	venueId: string,
	showId: string
): Promise<CloseSpec[]> {
	const [night, roomRows, due] = await Promise.all([
		loadNight(db, venueId, showId),
		db
			.select({ id: rooms.id, name: rooms.name, position: rooms.position })
			.from(rooms)
			.where(eq(rooms.venueId, venueId)),
		dueMaintenance(db, venueId)
	]);
	return generateCloseChecklist({
		rooms: roomRows,
		props: night.props.map((p) => ({ id: p.id, name: p.name, roomId: p.roomId })),
		outputs: night.outputs.map((o) => ({
			id: o.id,
			propId: o.propId,
			name: o.name,
			relayKind: o.relayKind
		})),
		maintenance: due.map((d) => ({
			outputId: d.outputId,
			propId: d.propId,
			since: d.since,
			line: maintenanceLine(d)
		}))
	});
}

async function closeSigned(db: Reader, venueId: string, showId: string) {
	const [row] = await db
		.select({
			id: closeSignOffs.id,
			at: closeSignOffs.at,
			note: closeSignOffs.note,
			by: users.name
		})
		.from(closeSignOffs)
		.leftJoin(users, eq(users.id, closeSignOffs.personId))
		.where(and(eq(closeSignOffs.venueId, venueId), eq(closeSignOffs.showId, showId)));
	return row ?? null;
}

/** What the stored close list lacks or has too many of against its inputs; null once signed. */
async function closeDiff(tx: Reader, venueId: string, showId: string) {
	const [signed, specs, stored] = await Promise.all([
		closeSigned(tx, venueId, showId),
		closeSpecs(tx, venueId, showId),
		tx
			.select()
			.from(closeChecks)
			.where(and(eq(closeChecks.venueId, venueId), eq(closeChecks.showId, showId)))
	]);
	if (signed) return null;
	const byKey = new Map(stored.map((c) => [c.key, c]));
	const changed = specs.filter((s) => {
		const r = byKey.get(s.key);
		return (
			!r ||
			r.removedAt !== null ||
			r.label !== s.label ||
			r.detail !== s.detail ||
			r.sortKey !== s.sortKey ||
			r.roomId !== s.roomId
		);
	});
	const wanted = new Set(specs.map((s) => s.key));
	const gone = stored.filter((c) => c.removedAt === null && !wanted.has(c.key)).map((c) => c.id);
	return changed.length || gone.length ? { changed, gone } : null;
}

/** Make the stored close list match its inputs, under the show's lock; a signed close is left. */
async function syncLocked(tx: Tx, venueId: string, showId: string) {
	const diff = await closeDiff(tx, venueId, showId);
	if (!diff) return;
	const { changed, gone } = diff;
	// In slices, so no statement passes PostgreSQL's parameter limit however many lines there are.
	for (let i = 0; i < changed.length; i += 500)
		await tx
			.insert(closeChecks)
			.values(changed.slice(i, i + 500).map((s) => ({ ...s, venueId, showId, removedAt: null })))
			.onConflictDoUpdate({
				target: [closeChecks.showId, closeChecks.key],
				set: {
					label: sql`excluded.label`,
					detail: sql`excluded.detail`,
					sortKey: sql`excluded.sort_key`,
					roomId: sql`excluded.room_id`,
					removedAt: null
				}
			});
	if (gone.length)
		await tx
			.update(closeChecks)
			.set({ removedAt: new Date() })
			.where(and(eq(closeChecks.venueId, venueId), anyUuid(closeChecks.id, gone)));
}

/**
 * Bring the close list up to date with its inputs. Read first, without a lock: when nothing
 * changed (every read after the first) nothing is written and no lock is taken.
 */
export async function syncClose(db: Db, venueId: string, showId: string) {
	if (!(await closeDiff(db, venueId, showId))) return;
	await db.transaction(async (tx) => {
		if (await lockShow(tx, venueId, showId)) await syncLocked(tx, venueId, showId);
	});
}

/**
 * The night's close list, up to date: compared with its inputs while it is read, and read again
 * only when they differed (then brought up to date under the show's lock first).
 */
export async function freshClose(db: Db, venueId: string, showId: string) {
	const [diff, state] = await Promise.all([
		closeDiff(db, venueId, showId),
		loadClose(db, venueId, showId)
	]);
	if (!diff) return state;
	await db.transaction(async (tx) => {
		if (await lockShow(tx, venueId, showId)) await syncLocked(tx, venueId, showId);
	});
	return loadClose(db, venueId, showId);
}

export interface CloseLine {
	id: string;
	key: string;
	kind: CloseSpec['kind'];
	label: string;
	detail: string;
	roomId: string | null;
	required: boolean;
	/** Ticked by itself (guest counts), not by a person. */
	automatic: boolean;
	state: 'open' | 'pass' | 'fail';
	by: string | null;
	at: Date | null;
	note: string | null;
}

/** The night's close list as stored, each line with its latest tick, and the close sign-off. */
export async function loadClose(db: Reader, venueId: string, showId: string) {
	const [lines, results, counted, signed, roomRows] = await Promise.all([
		db
			.select()
			.from(closeChecks)
			.where(and(eq(closeChecks.venueId, venueId), eq(closeChecks.showId, showId)))
			.orderBy(asc(closeChecks.sortKey)),
		db
			.select({
				closeCheckId: closeResults.closeCheckId,
				passed: closeResults.passed,
				note: closeResults.note,
				at: closeResults.at,
				by: users.name
			})
			.from(closeResults)
			.leftJoin(users, eq(users.id, closeResults.personId))
			.where(and(eq(closeResults.venueId, venueId), eq(closeResults.showId, showId)))
			.orderBy(asc(closeResults.at), asc(closeResults.id)),
		db
			.select({ at: guestCounts.at })
			.from(guestCounts)
			.where(and(eq(guestCounts.venueId, venueId), eq(guestCounts.showId, showId)))
			.limit(1),
		closeSigned(db, venueId, showId),
		db.select({ id: rooms.id, name: rooms.name }).from(rooms).where(eq(rooms.venueId, venueId))
	]);
	const latest = new Map<string, (typeof results)[number]>();
	for (const r of results) latest.set(r.closeCheckId, r);
	const out: CloseLine[] = lines
		.filter((l) => l.removedAt === null)
		.map((l) => {
			if (l.kind === 'guests')
				return {
					...pick(l),
					automatic: true,
					state: counted.length ? 'pass' : 'open',
					by: null,
					at: counted[0]?.at ?? null,
					note: null
				};
			const r = latest.get(l.id);
			return {
				...pick(l),
				automatic: false,
				state: r ? (r.passed ? 'pass' : 'fail') : 'open',
				by: r?.by ?? null,
				at: r?.at ?? null,
				note: r?.note ?? null
			};
		});
	const roomName = new Map(roomRows.map((r) => [r.id, r.name]));
	return {
		lines: out.map((l) => ({ ...l, room: l.roomId ? (roomName.get(l.roomId) ?? null) : null })),
		signed,
		ready: out.every((l) => !l.required || l.state === 'pass')
	};
}

function pick(l: typeof closeChecks.$inferSelect) {
	return {
		id: l.id,
		key: l.key,
		kind: l.kind,
		label: l.label,
		detail: l.detail,
		roomId: l.roomId,
		required: l.required
	};
}

export type CloseOutcome = { ok: true } | { ok: false; status: 400 | 404 | 409; message: string };

/** A tick (passed or not) on one close line by one person. */
export async function tickClose(
	db: Db,
	venueId: string,
	showId: string,
	personId: string,
	lineId: string,
	passed: boolean,
	note: string | null
): Promise<CloseOutcome> {
	return db.transaction(async (tx) => {
		if (!(await lockShow(tx, venueId, showId)))
			return { ok: false, status: 404, message: 'There is no such show.' };
		if (await closeSigned(tx, venueId, showId))
			return {
				ok: false,
				status: 409,
				message: 'This night has been closed; nothing more can be ticked.'
			};
		const uuid = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
		const [line] = uuid.test(lineId)
			? await tx
					.select()
					.from(closeChecks)
					.where(
						and(
							eq(closeChecks.id, lineId),
							eq(closeChecks.showId, showId),
							eq(closeChecks.venueId, venueId)
						)
					)
			: [];
		if (!line || line.removedAt)
			return { ok: false, status: 404, message: 'That line is no longer on tonight’s list.' };
		if (line.kind === 'guests')
			return {
				ok: false,
				status: 400,
				message: 'This line ticks itself once tonight’s guest count is entered on the show page.'
			};
		if (!passed && !note)
			return { ok: false, status: 400, message: 'Say what is wrong, so the next crew knows.' };
		await tx
			.insert(closeResults)
			.values({ venueId, showId, closeCheckId: line.id, passed, note, personId });
		return { ok: true };
	});
}

/** The show manager closes the night: every required line must have passed. */
export async function signClose(
	db: Db,
	venueId: string,
	showId: string,
	personId: string,
	note: string | null
): Promise<CloseOutcome> {
	return db.transaction(async (tx) => {
		if (!(await lockShow(tx, venueId, showId)))
			return { ok: false, status: 404, message: 'There is no such show.' };
		if (await closeSigned(tx, venueId, showId))
			return { ok: false, status: 409, message: 'This night has already been closed.' };
		await syncLocked(tx, venueId, showId);
		const state = await loadClose(tx, venueId, showId);
		const open = state.lines.filter((l) => l.required && l.state !== 'pass');
		if (open.length)
			return {
				ok: false,
				status: 400,
				message: `${open.length === 1 ? 'One line has' : `${open.length} lines have`} not passed yet: ${open.map((l) => l.label).join('; ')}.`
			};
		await tx.insert(closeSignOffs).values({ venueId, showId, personId, note });
		return { ok: true };
	});
}
