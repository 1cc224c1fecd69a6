import { and, eq, isNull } from 'drizzle-orm';
import { z } from 'zod';
import { evaluateSensorTest } from '$lib/checklists/evaluate';
import { judgeRecordedAt } from '$lib/checklists/times';
import { resultSchema } from '$lib/schemas/checklist';
import type { Role } from '$lib/roles';
import type { Db } from '$lib/server/db/client';
import { checkPhotos, checkResults, checks, shows, signOffs } from '$lib/server/db/schema';
import { showAccess } from './access';
import { boardSent } from '$lib/server/boards/checks';
import { notifyShow } from './live';

type Result = typeof checkResults.$inferSelect;
type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

export type RecordOutcome =
	| { ok: true; result: Result; replay: boolean }
	| { ok: false; status: number; message: string; errors?: Record<string, string[]> };

/** Where a check photo of this show lives in the object store. Only the server makes these keys. */
export const photoPrefix = (venueId: string, showId: string) =>
	`venues/${venueId}/shows/${showId}/checks/`;

/** A stored key the photo route may serve for this show: under its prefix, one plain file name. */
export function isShowPhotoKey(key: string, venueId: string, showId: string) {
	const prefix = photoPrefix(venueId, showId);
	return key.startsWith(prefix) && /^[0-9a-f-]{36}\.(png|jpg|webp)$/.test(key.slice(prefix.length));
}

/**
 * Take the show's row lock for the rest of the transaction. Recording and sign-off both take it,
 * so a result is either counted by a sign-off or arrives after it, never in between.
 */
export async function lockShow(tx: Tx, venueId: string, showId: string) {
	const [row] = await tx
		.select({ id: shows.id })
		.from(shows)
		.where(and(eq(shows.id, showId), eq(shows.venueId, venueId)))
		.for('update');
	return Boolean(row);
}

const refused = (
	status: number,
	message: string,
	errors?: Record<string, string[]>
): RecordOutcome => ({ ok: false, status, message, errors });

/**
 * Record one result, appended to the check's history. A clientId already stored answers with the
 * stored result, so a phone replaying a result after a dropped connection never stores it twice.
 * Sensor tests with a band are judged here from the readings, whatever the phone said. The phone's
 * recorded time is kept beside the received time; a result arriving after sign-off is kept as a
 * late correction and leaves the sign-off as it was.
 */
export async function recordResult(
	db: Db,
	opts: { venue: { id: string; role: Role }; personId: string; showId: string; body: unknown }
): Promise<RecordOutcome> {
	const access = await showAccess(db, opts.venue, opts.personId, opts.showId);
	if (!access.ok) return access;
	const parsed = resultSchema.safeParse(opts.body);
	if (!parsed.success)
		return refused(
			400,
			'The result could not be recorded; see the fields.',
			z.flattenError(parsed.error).fieldErrors as Record<string, string[]>
		);
	const input = parsed.data;
	const venueId = opts.venue.id;
	const showId = access.show.id;

	const replayOf = async (): Promise<RecordOutcome | null> => {
		const [earlier] = await db
			.select()
			.from(checkResults)
			.where(eq(checkResults.clientId, input.clientId));
		if (!earlier) return null;
		if (earlier.checkId === input.checkId && earlier.venueId === venueId)
			return { ok: true, result: earlier, replay: true };
		return refused(409, 'That result id was already used for another check.');
	};
	const seen = await replayOf();
	if (seen) return seen;

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
	if (!check) return refused(404, "That check is no longer on this night's list.");

	let outcome = input.outcome;
	let idle: number | null = null;
	let present: number | null = null;
	let boardReadAt: Date | null = null;
	if (check.expected.mode === 'reading') {
		const errors: Record<string, string[]> = {};
		if (input.idleReading === null) errors.idleReading = ['Record the idle reading.'];
		if (input.presentReading === null) errors.presentReading = ['Record the present reading.'];
		if (Object.keys(errors).length)
			return refused(400, 'A sensor test needs both readings.', errors);
		idle = input.idleReading;
		present = input.presentReading;
		outcome = evaluateSensorTest(check.expected.band, idle!, present!).outcome;
		// "From the board" is kept only when the board really sent that present reading then.
		if (input.fromBoard && input.boardReadAt && check.sensorId) {
			const at = new Date(input.boardReadAt);
			if (await boardSent(db, venueId, check.sensorId, present!, at)) boardReadAt = at;
		}
	} else if (!outcome) {
		return refused(400, 'Choose pass or fail.', { outcome: ['Choose pass or fail.'] });
	}

	let photoKey: string | null = null;
	if (input.photoId) {
		const [photo] = await db
			.select({ key: checkPhotos.key })
			.from(checkPhotos)
			.where(
				and(
					eq(checkPhotos.id, input.photoId),
					eq(checkPhotos.showId, showId),
					eq(checkPhotos.venueId, venueId)
				)
			);
		if (!photo)
			return refused(400, 'That photo was not uploaded for this night.', {
				photoId: ['Upload the photo again.']
			});
		photoKey = photo.key;
	}

	const row = await db.transaction(async (tx) => {
		await lockShow(tx, venueId, showId);
		const [signed] = await tx
			.select({ id: signOffs.id })
			.from(signOffs)
			.where(eq(signOffs.showId, showId));
		const receivedAt = new Date();
		const when = judgeRecordedAt(input.recordedAt ? new Date(input.recordedAt) : null, receivedAt);
		const [stored] = await tx
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
				photoKey,
				clientId: input.clientId,
				recordedAt: when.recordedAt,
				receivedAt,
				clockSuspect: when.clockSuspect,
				afterSignOff: Boolean(signed),
				fromBoard: boardReadAt !== null,
				boardReadAt
			})
			.onConflictDoNothing({ target: checkResults.clientId })
			.returning();
		return stored ?? null;
	});
	// The same result arrived twice at once: the other request stored it.
	if (!row) return (await replayOf())!;
	await notifyShow(db, showId);
	return { ok: true, result: row, replay: false };
}
