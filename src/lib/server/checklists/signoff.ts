import { and, eq } from 'drizzle-orm';
import { signOffBlockers } from '$lib/checklists/view';
import type { Db } from '$lib/server/db/client';
import {
	props,
	rooms,
	signOffs,
	standDownRestores,
	standDowns,
	type CrewProblemAck
} from '$lib/server/db/schema';
import { SAFE_STATE_LABELS } from '$lib/schemas/prop-words';
import { buildShowRunSheets } from '$lib/server/runsheets/build';
import { latestSends } from '$lib/server/runsheets/send';
import { loadScene } from '$lib/server/scenes/model';
import { showConflicts, type Conflict } from '$lib/server/schedule/shows';
import { lockShow } from './record';
import { isUniqueViolation } from '$lib/server/db/errors';
import { audit } from '$lib/server/audit';
import { notifyShow } from './live';
import { loadChecklist } from './state';
import { refreshLocked } from './sync';
import { notRestored, scenesForShow } from '$lib/server/scenes/for-show';

type Venue = { id: string; slug: string };

type Refusal = { ok: false; message: string };

async function nightProp(db: Db, venue: Venue, showId: string, propId: string) {
	const [prop] = await db
		.select({ id: props.id, name: props.name })
		.from(props)
		.where(and(eq(props.id, propId), eq(props.venueId, venue.id)));
	if (!prop) return { ok: false as const, message: 'There is no such prop.' };
	const night = await scenesForShow(db, venue.id, showId);
	const theirs = night.filter((s) => s.propIds.includes(prop.id));
	if (!theirs.length)
		return { ok: false as const, message: `${prop.name} is not in any of tonight's scenes.` };
	return { ok: true as const, prop, night, theirs };
}

async function standing(db: Pick<Db, 'select'>, showId: string, propId: string) {
	const [row] = await db
		.select({ id: standDowns.id })
		.from(standDowns)
		.where(and(eq(standDowns.showId, showId), eq(standDowns.propId, propId), notRestored()));
	return row ?? null;
}

async function isSignedOff(db: Pick<Db, 'select'>, showId: string) {
	const [row] = await db
		.select({ id: signOffs.id })
		.from(signOffs)
		.where(eq(signOffs.showId, showId));
	return Boolean(row);
}

export interface StandDownPreview {
	prop: { id: string; name: string };
	/** The scenes that use the prop: each holds its outputs in their safe state tonight. */
	scenes: {
		id: string;
		name: string;
		room: string | null;
		outputs: { name: string; safeState: string }[];
		/** Already held safe by another prop's stand-down. */
		alreadySafe: boolean;
	}[];
	/** The people whose run sheet reads differently after the stand-down. */
	recipients: { personId: string; name: string; position: string; sentBefore: boolean }[];
	/** Run sheets for the night went out already: the changed ones are e-mailed at once. */
	sheetsSent: boolean;
}

/** What standing a prop down would do tonight, without doing it. */
export async function standDownPreview(
	db: Db,
	venue: Venue,
	showId: string,
	propId: string,
	origin: string
): Promise<({ ok: true } & StandDownPreview) | Refusal> {
	const found = await nightProp(db, venue, showId, propId);
	if (!found.ok) return found;
	const { prop, theirs } = found;
	if (await isSignedOff(db, showId))
		return { ok: false, message: 'This night is signed off; nothing more can be stood down.' };
	if (await standing(db, showId, prop.id))
		return { ok: false, message: `${prop.name} is already stood down for this night.` };
	const roomRows = await db
		.select({ id: rooms.id, name: rooms.name })
		.from(rooms)
		.where(eq(rooms.venueId, venue.id));
	const scenes: StandDownPreview['scenes'] = [];
	for (const s of theirs) {
		const loaded = await loadScene(db, venue.id, s.id);
		scenes.push({
			id: s.id,
			name: s.name,
			room: roomRows.find((r) => r.id === s.roomId)?.name ?? null,
			outputs: (loaded?.outputRows ?? []).map((o) => ({
				name: o.name,
				safeState: SAFE_STATE_LABELS[o.safeState]
			})),
			alreadySafe: s.stoodDown
		});
	}
	const [before, after, sent] = await Promise.all([
		buildShowRunSheets(db, venue.id, showId, origin),
		buildShowRunSheets(db, venue.id, showId, origin, {
			assumeDown: { propId: prop.id, reason: 'preview' }
		}),
		latestSends(db, showId)
	]);
	const was = new Map(before?.sheets.map((x) => [x.personId, x.contentHash]));
	const recipients = (after?.sheets ?? [])
		.filter((x) => was.get(x.personId) !== x.contentHash)
		.map((x) => ({
			personId: x.personId,
			name: x.name,
			position: x.data.position,
			sentBefore: sent.has(x.personId)
		}));
	return { ok: true, prop, scenes, recipients, sheetsSent: sent.size > 0 };
}

/**
 * Stand a prop down for one night: its scenes hold their safe state. Refused once the night is
 * signed off; undone only by a restore, which keeps both reasons. Audited.
 */
export async function standDown(
	db: Db,
	venue: Venue,
	showId: string,
	personId: string,
	input: { propId: string; reason: string }
): Promise<{ ok: true } | Refusal> {
	const found = await nightProp(db, venue, showId, input.propId);
	if (!found.ok) return found;
	const { prop } = found;
	const done = await db.transaction(async (tx): Promise<{ ok: true } | Refusal> => {
		if (!(await lockShow(tx, venue.id, showId)))
			return { ok: false, message: 'There is no such show.' };
		if (await isSignedOff(tx, showId))
			return { ok: false, message: 'This night is signed off; nothing more can be stood down.' };
		if (await standing(tx, showId, prop.id))
			return { ok: false, message: `${prop.name} is already stood down for this night.` };
		await tx
			.insert(standDowns)
			.values({ venueId: venue.id, showId, propId: prop.id, reason: input.reason, personId });
		return { ok: true };
	});
	if (!done.ok) return done;
	await audit(db, {
		venueId: venue.id,
		personId,
		action: 'show.prop_stood_down',
		detail: { show: showId, prop: prop.name, reason: input.reason }
	});
	await notifyShow(db, showId);
	return { ok: true };
}

/** Undo a stand-down before sign-off: the prop's scenes run again. Both reasons are kept. */
export async function restoreStandDown(
	db: Db,
	venue: Venue,
	showId: string,
	personId: string,
	input: { standDownId: string; reason: string }
): Promise<{ ok: true; propName: string } | Refusal> {
	const done = await db
		.transaction(async (tx): Promise<{ ok: true; propName: string } | Refusal> => {
			if (!(await lockShow(tx, venue.id, showId)))
				return { ok: false, message: 'There is no such show.' };
			if (await isSignedOff(tx, showId))
				return {
					ok: false,
					message: 'This night is signed off; its stand-downs stay as they were signed.'
				};
			const [down] = await tx
				.select({ id: standDowns.id, propName: props.name })
				.from(standDowns)
				.innerJoin(props, eq(props.id, standDowns.propId))
				.where(
					and(
						eq(standDowns.id, input.standDownId),
						eq(standDowns.showId, showId),
						eq(standDowns.venueId, venue.id)
					)
				);
			if (!down) return { ok: false, message: 'That stand-down no longer exists.' };
			await tx.insert(standDownRestores).values({
				venueId: venue.id,
				standDownId: down.id,
				reason: input.reason,
				personId
			});
			return { ok: true, propName: down.propName };
		})
		.catch((e) => {
			if (isUniqueViolation(e))
				return { ok: false as const, message: 'That prop is already restored.' };
			throw e;
		});
	if (!done.ok) return done;
	await audit(db, {
		venueId: venue.id,
		personId,
		action: 'show.prop_restored',
		detail: { show: showId, prop: done.propName, reason: input.reason }
	});
	await notifyShow(db, showId);
	return done;
}

/**
 * The night's crew problems (required posts unfilled, double-bookings, unavailable people
 * assigned), each with a key the sign-off form sends back to acknowledge it.
 */
export async function crewProblems(
	db: Db,
	venueId: string,
	showId: string
): Promise<CrewProblemAck[]> {
	return crewProblemsOf(await showConflicts(db, venueId, showId));
}

/** The crew problems of a night from its conflicts, keyed as the sign-off form sends them back. */
export function crewProblemsOf(conflicts: Conflict[]): CrewProblemAck[] {
	const seen = new Map<string, number>();
	return conflicts.map((c) => {
		const base = `${c.kind}:${c.positionId ?? c.personId ?? ''}`;
		const n = (seen.get(base) ?? 0) + 1;
		seen.set(base, n);
		return { key: n === 1 ? base : `${base}:${n}`, kind: c.kind, message: c.message };
	});
}

export type SignOffRefusal = {
	ok: false;
	message: string;
	blockers: string[];
	/** Crew problems not yet acknowledged. */
	unacknowledged?: CrewProblemAck[];
};

/**
 * Sign the night off: allowed only when every required check passed or its prop is stood down,
 * and the show manager acknowledged each of the night's crew problems (kept with the sign-off).
 * Holds the show's lock from reading the checks to storing the sign-off, so a result arriving
 * meanwhile waits and is then stored as a late correction. The sign-off is permanent.
 */
export async function signOff(
	db: Db,
	venue: Venue,
	showId: string,
	personId: string,
	note: string | null,
	acknowledged: string[] = []
): Promise<{ ok: true } | SignOffRefusal> {
	const problems = await crewProblems(db, venue.id, showId);
	const acked = new Set(acknowledged);
	const unacknowledged = problems.filter((p) => !acked.has(p.key));
	const done = await db
		.transaction(
			async (tx): Promise<{ ok: true; checks: number; stoodDown: string[] } | SignOffRefusal> => {
				await lockShow(tx, venue.id, showId);
				// Sign what the night's scenes make now, not a list from before their last change.
				await refreshLocked(tx, venue.id, showId);
				const state = await loadChecklist(tx, venue, showId);
				if (state.signOff)
					return { ok: false, message: 'This night is already signed off.', blockers: [] };
				if (state.checks.length === 0)
					return { ok: false, message: 'There is no checklist for this night yet.', blockers: [] };
				const blockers = signOffBlockers(state.checks);
				if (blockers.length)
					return {
						ok: false,
						message: `Not yet: ${blockers.length} required ${blockers.length === 1 ? 'check has' : 'checks have'} not passed. Record them, or stand the failing prop down with a reason.`,
						blockers
					};
				if (unacknowledged.length)
					return {
						ok: false,
						message: `Acknowledge ${unacknowledged.length === 1 ? "the night's crew problem" : `each of the night's ${unacknowledged.length} crew problems`} before signing off.`,
						blockers: [],
						unacknowledged
					};
				await tx
					.insert(signOffs)
					.values({ venueId: venue.id, showId, personId, note, acknowledged: problems });
				return {
					ok: true,
					checks: state.checks.length,
					stoodDown: state.standDowns.map((d) => d.propName)
				};
			}
		)
		.catch((e) => {
			if (isUniqueViolation(e))
				return { ok: false as const, message: 'This night is already signed off.', blockers: [] };
			throw e;
		});
	if (!done.ok) return done;
	await audit(db, {
		venueId: venue.id,
		personId,
		action: 'show.signed_off',
		detail: {
			show: showId,
			checks: done.checks,
			stoodDown: done.stoodDown,
			acknowledged: problems.map((p) => p.message),
			note
		}
	});
	await notifyShow(db, showId);
	return { ok: true };
}
