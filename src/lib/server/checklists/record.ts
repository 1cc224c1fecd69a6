import { and, eq, isNull, sql } from 'drizzle-orm';
import { z } from 'zod';
import { evaluateSensorTest } from '$lib/checklists/evaluate';
import { resultSchema } from '$lib/schemas/checklist';
import type { Role } from '$lib/roles';
import type { Db } from '$lib/server/db/client';
import { checkResults, checks, signOffs } from '$lib/server/db/schema';
import { showAccess } from './access';
import { notifyShow } from './live';

type Result = typeof checkResults.$inferSelect;

export type RecordOutcome =
	| { ok: true; result: Result; replay: boolean }
	| { ok: false; status: number; message: string; errors?: Record<string, string[]> };

/** Where a check photo of this show must live in the object store. */
export const photoPrefix = (venueId: string, showId: string) =>
	`venues/${venueId}/shows/${showId}/checks/`;

/**
 * Record one result, appended to the check's history. A clientId already stored answers with the
 * stored result, so a phone replaying a result after a dropped connection never stores it twice.
 * Sensor tests with a band are judged here from the readings, whatever the phone said.
 */
export async function recordResult(
	db: Db,
	opts: { venue: { id: string; role: Role }; personId: string; showId: string; body: unknown }
): Promise<RecordOutcome> {
	const access = await showAccess(db, opts.venue, opts.personId, opts.showId);
	if (!access.ok) return access;
	const parsed = resultSchema.safeParse(opts.body);
	if (!parsed.success)
		return {
			ok: false,
			status: 400,
			message: 'The result could not be recorded; see the fields.',
			errors: z.flattenError(parsed.error).fieldErrors as Record<string, string[]>
		};
	const input = parsed.data;
	const venueId = opts.venue.id;
	const showId = access.show.id;

	const [earlier] = await db
		.select()
		.from(checkResults)
		.where(eq(checkResults.clientId, input.clientId));
	if (earlier) {
		if (earlier.checkId === input.checkId && earlier.venueId === venueId)
			return { ok: true, result: earlier, replay: true };
		return {
			ok: false,
			status: 409,
			message: 'That result id was already used for another check.'
		};
	}

	const [signed] = await db
		.select({ id: signOffs.id })
		.from(signOffs)
		.where(eq(signOffs.showId, showId));
	if (signed)
		return {
			ok: false,
			status: 409,
			message: 'This night is signed off; its checklist is closed.'
		};

	const [check] = await db
		.select()
		.from(checks)
		.where(
			and(
				eq(checks.id, input.checkId),
				eq(checks.showId, showId),
				eq(checks.venueId, venueId),
				isNull(checks.removedAt)
			)
		);
	if (!check)
		return { ok: false, status: 404, message: "That check is no longer on this night's list." };

	let outcome = input.outcome;
	let idle: number | null = null;
	let present: number | null = null;
	if (check.expected.mode === 'reading') {
		const errors: Record<string, string[]> = {};
		if (input.idleReading === null) errors.idleReading = ['Record the idle reading.'];
		if (input.presentReading === null) errors.presentReading = ['Record the present reading.'];
		if (Object.keys(errors).length)
			return { ok: false, status: 400, message: 'A sensor test needs both readings.', errors };
		idle = input.idleReading;
		present = input.presentReading;
		outcome = evaluateSensorTest(check.expected.band, idle!, present!).outcome;
	} else if (!outcome) {
		return {
			ok: false,
			status: 400,
			message: 'Choose pass or fail.',
			errors: { outcome: ['Choose pass or fail.'] }
		};
	}
	if (input.photoKey && !input.photoKey.startsWith(photoPrefix(venueId, showId)))
		return {
			ok: false,
			status: 400,
			message: 'That photo belongs to another show.',
			errors: { photoKey: ['Upload the photo again.'] }
		};

	const [row] = await db
		.insert(checkResults)
		.values({
			venueId,
			showId,
			checkId: check.id,
			personId: opts.personId,
			outcome: outcome!,
			idleReading: idle,
			presentReading: present,
			note: input.note,
			photoKey: input.photoKey ?? null,
			clientId: input.clientId,
			recordedAt: sql`clock_timestamp()`
		})
		.onConflictDoNothing({ target: checkResults.clientId })
		.returning();
	if (!row) {
		// The same result arrived twice at once: the other request stored it.
		const [stored] = await db
			.select()
			.from(checkResults)
			.where(eq(checkResults.clientId, input.clientId));
		return { ok: true, result: stored, replay: true };
	}
	await notifyShow(db, showId);
	return { ok: true, result: row, replay: false };
}
