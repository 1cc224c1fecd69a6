import { and, eq } from 'drizzle-orm';
import { signOffBlockers } from '$lib/checklists/view';
import type { Db } from '$lib/server/db/client';
import { props, signOffs, standDowns, type CrewProblemAck } from '$lib/server/db/schema';
import { showConflicts, type Conflict } from '$lib/server/schedule/shows';
import { lockShow } from './record';
import { isUniqueViolation } from '$lib/server/db/errors';
import { audit } from '$lib/server/audit';
import { notifyShow } from './live';
import { loadChecklist } from './state';
import { refreshLocked } from './sync';
import { scenesForShow } from '$lib/server/scenes/for-show';

type Venue = { id: string; slug: string };

/** Stand a prop down for one night: its scenes hold their safe state. Permanent, audited. */
export async function standDown(
	db: Db,
	venue: Venue,
	showId: string,
	personId: string,
	input: { propId: string; reason: string }
): Promise<{ ok: true } | { ok: false; message: string }> {
	const [prop] = await db
		.select({ id: props.id, name: props.name })
		.from(props)
		.where(and(eq(props.id, input.propId), eq(props.venueId, venue.id)));
	if (!prop) return { ok: false, message: 'There is no such prop.' };
	const night = await scenesForShow(db, venue.id, showId);
	if (!night.some((s) => s.propIds.includes(prop.id)))
		return { ok: false, message: `${prop.name} is not in any of tonight's scenes.` };
	try {
		await db.insert(standDowns).values({
			venueId: venue.id,
			showId,
			propId: prop.id,
			reason: input.reason,
			personId
		});
	} catch (e) {
		if (isUniqueViolation(e))
			return { ok: false, message: `${prop.name} is already stood down for this night.` };
		throw e;
	}
	await audit(db, {
		venueId: venue.id,
		personId,
		action: 'show.prop_stood_down',
		detail: { show: showId, prop: prop.name, reason: input.reason }
	});
	await notifyShow(db, showId);
	return { ok: true };
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
