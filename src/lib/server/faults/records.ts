// Faults on props and what happens to them: reported by anyone on the night, repaired by a
// designer, re-tested, closed only after a passing re-test. Every step is a new row (faults and
// fault_events are append-only), written in one transaction under the fault's row lock.
import { and, asc, desc, eq, inArray, isNotNull, sql } from 'drizzle-orm';
import type { z } from 'zod';
import type { Db } from '$lib/server/db/client';
import {
	checkPhotos,
	checkResults,
	checks,
	faultEvents,
	faults,
	props,
	rooms,
	shows,
	users
} from '$lib/server/db/schema';
import {
	downtimeMinutes,
	faultState,
	verifiedAt,
	type FaultSeverity,
	type FaultState
} from '$lib/faults/downtime';
import type {
	faultCloseSchema,
	faultRepairSchema,
	faultReportSchema,
	faultRetestSchema
} from '$lib/schemas/fault';

type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];
export type FaultOutcome =
	{ ok: true; id: string } | { ok: false; status: number; field: string; message: string };

const refuse = (status: number, field: string, message: string): FaultOutcome => ({
	ok: false,
	status,
	field,
	message
});

/** A check result's time for ordering: the phone's, unless its clock looked wrong. */
const resultAt = sql<Date>`(case when ${checkResults.clockSuspect} then ${checkResults.receivedAt} else ${checkResults.recordedAt} end)`;

export async function reportFault(
	db: Db,
	venueId: string,
	personId: string,
	propId: string,
	input: z.infer<typeof faultReportSchema>
): Promise<FaultOutcome> {
	const [prop] = await db
		.select({ id: props.id, roomId: props.roomId })
		.from(props)
		.where(and(eq(props.id, propId), eq(props.venueId, venueId)));
	if (!prop) return refuse(404, 'propId', 'That prop is no longer in this venue.');
	let roomId = input.roomId ?? prop.roomId;
	if (input.roomId) {
		const [room] = await db
			.select({ id: rooms.id })
			.from(rooms)
			.where(and(eq(rooms.id, input.roomId), eq(rooms.venueId, venueId)));
		if (!room) return refuse(400, 'roomId', 'That room is no longer in this venue; pick another.');
		roomId = room.id;
	}
	let showId: string | null = null;
	let checkId: string | null = null;
	let photoKey: string | null = null;
	if (input.showId) {
		const [show] = await db
			.select({ id: shows.id })
			.from(shows)
			.where(and(eq(shows.id, input.showId), eq(shows.venueId, venueId)));
		if (!show) return refuse(400, 'showId', 'That night is no longer in this venue.');
		showId = show.id;
	}
	if (input.checkId) {
		const [check] = await db
			.select({ id: checks.id, showId: checks.showId })
			.from(checks)
			.where(
				and(eq(checks.id, input.checkId), eq(checks.venueId, venueId), eq(checks.propId, propId))
			);
		if (!check) return refuse(400, 'checkId', 'That check is not one of this prop’s.');
		checkId = check.id;
		showId = check.showId;
		if (input.checkPhoto) {
			const [latest] = await db
				.select({ photoKey: checkResults.photoKey })
				.from(checkResults)
				.where(and(eq(checkResults.checkId, check.id), isNotNull(checkResults.photoKey)))
				.orderBy(desc(resultAt))
				.limit(1);
			photoKey = latest?.photoKey ?? null;
		}
	}
	if (input.photoId) {
		if (!showId) return refuse(400, 'photoId', 'A photo can be added when reporting from a night.');
		const [photo] = await db
			.select({ key: checkPhotos.key })
			.from(checkPhotos)
			.where(
				and(
					eq(checkPhotos.id, input.photoId),
					eq(checkPhotos.venueId, venueId),
					eq(checkPhotos.showId, showId)
				)
			);
		if (!photo) return refuse(400, 'photoId', 'That photo was not uploaded; upload it again.');
		photoKey = photo.key;
	}
	const id = await db.transaction(async (tx) => {
		const [row] = await tx
			.insert(faults)
			.values({
				venueId,
				propId,
				roomId,
				showId,
				checkId,
				severity: input.severity,
				seen: input.seen,
				photoKey,
				personId
			})
			.returning({ id: faults.id, at: faults.reportedAt });
		await tx
			.insert(faultEvents)
			.values({ venueId, faultId: row.id, kind: 'reported', personId, at: row.at });
		return row.id;
	});
	return { ok: true, id };
}

/** The fault under its row lock, with its events so far; null when it is not this prop's. */
async function lockFault(tx: Tx, venueId: string, propId: string, faultId: string) {
	const [fault] = await tx
		.select()
		.from(faults)
		.where(and(eq(faults.id, faultId), eq(faults.venueId, venueId), eq(faults.propId, propId)))
		.for('update');
	if (!fault) return null;
	const events = await tx
		.select()
		.from(faultEvents)
		.where(eq(faultEvents.faultId, fault.id))
		.orderBy(asc(faultEvents.at));
	return { fault, events, state: faultState(events) };
}

const GONE = 'That fault is not on this prop any more.';
const CLOSED = 'That fault is already closed.';

export async function repairFault(
	db: Db,
	venueId: string,
	personId: string,
	propId: string,
	input: z.infer<typeof faultRepairSchema>
): Promise<FaultOutcome> {
	return db.transaction(async (tx) => {
		const found = await lockFault(tx, venueId, propId, input.faultId);
		if (!found) return refuse(404, 'faultId', GONE);
		if (found.state === 'closed') return refuse(400, 'faultId', CLOSED);
		await tx.insert(faultEvents).values({
			venueId,
			faultId: found.fault.id,
			kind: 'repaired',
			action: input.action,
			parts: input.parts ?? null,
			minutes: input.minutes,
			personId
		});
		return { ok: true, id: found.fault.id };
	});
}

export async function retestFault(
	db: Db,
	venueId: string,
	personId: string,
	propId: string,
	input: z.infer<typeof faultRetestSchema>
): Promise<FaultOutcome> {
	return db.transaction(async (tx) => {
		const found = await lockFault(tx, venueId, propId, input.faultId);
		if (!found) return refuse(404, 'faultId', GONE);
		if (found.state === 'closed') return refuse(400, 'faultId', CLOSED);
		if (found.state === 'open')
			return refuse(400, 'outcome', 'Record the repair first; the re-test checks the repair.');
		await tx.insert(faultEvents).values({
			venueId,
			faultId: found.fault.id,
			kind: 'retested',
			passed: input.outcome === 'pass',
			note: input.note ?? null,
			personId
		});
		return { ok: true, id: found.fault.id };
	});
}

/**
 * Close a fault. It needs a passing re-test after its latest repair: one recorded here, or else the
 * first passing result of one of the prop's checks recorded after the repair, which is linked as
 * the re-test. Without either it stays open.
 */
export async function closeFault(
	db: Db,
	venueId: string,
	personId: string,
	propId: string,
	input: z.infer<typeof faultCloseSchema>
): Promise<FaultOutcome> {
	return db.transaction(async (tx) => {
		const found = await lockFault(tx, venueId, propId, input.faultId);
		if (!found) return refuse(404, 'faultId', GONE);
		if (found.state === 'closed') return refuse(400, 'faultId', CLOSED);
		const repair = found.events.findLast((e) => e.kind === 'repaired');
		if (!repair)
			return refuse(400, 'faultId', 'This fault has no repair yet: a designer records it first.');
		if (found.state !== 'verified') {
			const [pass] = await tx
				.select({ id: checkResults.id, at: resultAt })
				.from(checkResults)
				.innerJoin(checks, eq(checks.id, checkResults.checkId))
				.where(
					and(
						eq(checks.venueId, venueId),
						eq(checks.propId, propId),
						eq(checkResults.outcome, 'pass'),
						sql`${resultAt} > ${repair.at.toISOString()}::timestamptz`
					)
				)
				.orderBy(asc(resultAt))
				.limit(1);
			if (!pass)
				return refuse(
					400,
					'faultId',
					'This fault cannot be closed yet: the prop needs a passing re-test after the repair.'
				);
			await tx.insert(faultEvents).values({
				venueId,
				faultId: found.fault.id,
				kind: 'retested',
				passed: true,
				checkResultId: pass.id,
				personId,
				at: new Date(pass.at)
			});
		}
		await tx.insert(faultEvents).values({
			venueId,
			faultId: found.fault.id,
			kind: 'closed',
			note: input.note ?? null,
			personId
		});
		return { ok: true, id: found.fault.id };
	});
}

export interface FaultView {
	id: string;
	propId: string;
	propName: string;
	roomId: string | null;
	roomName: string | null;
	severity: FaultSeverity;
	seen: string;
	hasPhoto: boolean;
	reportedAt: Date;
	reportedBy: string | null;
	state: FaultState;
	verifiedAt: Date | null;
	downtimeMinutes: number;
	events: {
		kind: string;
		at: Date;
		by: string | null;
		action: string | null;
		parts: string | null;
		minutes: number | null;
		passed: boolean | null;
		linked: boolean;
		note: string | null;
	}[];
}

/** The venue's faults, newest first, with their state and downtime; optionally one prop, rooms, open only. */
export async function listFaults(
	db: Db,
	venueId: string,
	opts: { propId?: string; roomIds?: string[]; openOnly?: boolean; now?: Date } = {}
): Promise<FaultView[]> {
	if (opts.roomIds && opts.roomIds.length === 0) return [];
	const rows = await db
		.select({
			fault: faults,
			propName: props.name,
			roomName: rooms.name,
			by: users.name
		})
		.from(faults)
		.innerJoin(props, eq(props.id, faults.propId))
		.leftJoin(rooms, eq(rooms.id, faults.roomId))
		.leftJoin(users, eq(users.id, faults.personId))
		.where(
			and(
				eq(faults.venueId, venueId),
				opts.propId ? eq(faults.propId, opts.propId) : undefined,
				opts.roomIds ? inArray(faults.roomId, opts.roomIds) : undefined
			)
		)
		.orderBy(desc(faults.reportedAt));
	if (!rows.length) return [];
	const events = await db
		.select({ event: faultEvents, by: users.name })
		.from(faultEvents)
		.leftJoin(users, eq(users.id, faultEvents.personId))
		.where(
			and(
				eq(faultEvents.venueId, venueId),
				inArray(
					faultEvents.faultId,
					rows.map((r) => r.fault.id)
				)
			)
		)
		.orderBy(asc(faultEvents.at));
	const now = opts.now ?? new Date();
	const views = rows.map(({ fault, propName, roomName, by }) => {
		const mine = events.filter((e) => e.event.faultId === fault.id).map((e) => e.event);
		const verified = verifiedAt(mine);
		const state = faultState(mine);
		return {
			id: fault.id,
			propId: fault.propId,
			propName,
			roomId: fault.roomId,
			roomName,
			severity: fault.severity,
			seen: fault.seen,
			hasPhoto: fault.photoKey !== null,
			reportedAt: fault.reportedAt,
			reportedBy: by,
			state,
			verifiedAt: state === 'closed' || state === 'verified' ? verified : null,
			downtimeMinutes: downtimeMinutes(
				fault.reportedAt,
				state === 'closed' || state === 'verified' ? verified : null,
				now
			),
			events: events
				.filter((e) => e.event.faultId === fault.id)
				.map(({ event: e, by }) => ({
					kind: e.kind,
					at: e.at,
					by,
					action: e.action,
					parts: e.parts,
					minutes: e.minutes,
					passed: e.passed,
					linked: e.checkResultId !== null,
					note: e.note
				}))
		};
	});
	return opts.openOnly ? views.filter((v) => v.state !== 'closed') : views;
}
