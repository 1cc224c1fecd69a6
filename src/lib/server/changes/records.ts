// Change control: once a prop has been on a signed-off night, a change to its sensor, trigger
// range, outputs or curves asks for a reason and is kept as a change record (append-only). Until a
// later night with the prop is signed off, that prop's checklists carry a required re-test line.
import { and, asc, desc, eq, inArray, lt, sql } from 'drizzle-orm';
import type { Db } from '$lib/server/db/client';
import { changeRecords, checks, props, shows, signOffs, users } from '$lib/server/db/schema';
import type { ChangePart } from '$lib/schemas/change-words';
import { summarise, type Difference } from '$lib/props/changes';
import { nightPropIds } from '$lib/server/scenes/for-show';

type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];
type Reader = Pick<Db, 'select' | 'selectDistinct'>;

/** The latest signed-off night on which the prop had checks, or null when it has had none. */
export async function lastSignedNight(db: Reader, venueId: string, propId: string) {
	const [row] = await db
		.select({ showId: signOffs.showId, date: shows.date, signedAt: signOffs.at })
		.from(signOffs)
		.innerJoin(shows, eq(shows.id, signOffs.showId))
		.where(
			and(
				eq(signOffs.venueId, venueId),
				sql`exists (select 1 from ${checks} where ${checks.showId} = ${signOffs.showId} and ${checks.propId} = ${propId})`
			)
		)
		.orderBy(desc(signOffs.at))
		.limit(1);
	return row ?? null;
}

export const REASON_FIELD = 'changeReason';
const REASON_MAX = 1000;

export type ReasonCheck =
	{ ok: true; reason: string | null } | { ok: false; errors: Record<string, string[]> };

/**
 * Whether a save may go ahead: a change (diffs not empty) to a prop that has been on a signed-off
 * night needs a reason in the form's changeReason field; any other save needs none.
 */
export async function checkReason(
	db: Reader,
	venueId: string,
	propId: string,
	diffs: Difference[],
	raw: Record<string, unknown>
): Promise<ReasonCheck> {
	if (diffs.length === 0) return { ok: true, reason: null };
	const signed = await lastSignedNight(db, venueId, propId);
	if (!signed) return { ok: true, reason: null };
	const reason = typeof raw[REASON_FIELD] === 'string' ? raw[REASON_FIELD].trim() : '';
	if (reason === '')
		return {
			ok: false,
			errors: {
				[REASON_FIELD]: [
					'This prop has been on a signed-off night: say why you are changing it. The next night’s checklist will ask for a re-test.'
				]
			}
		};
	if (reason.length > REASON_MAX)
		return {
			ok: false,
			errors: { [REASON_FIELD]: [`Keep the reason under ${REASON_MAX} characters.`] }
		};
	return { ok: true, reason };
}

export interface ChangeInput {
	venueId: string;
	propId: string;
	sensorId?: string | null;
	outputId?: string | null;
	part: ChangePart;
	partName: string;
	diffs: Difference[];
	oldValue: Record<string, unknown>;
	newValue: Record<string, unknown>;
	reason: string;
	personId: string;
}

/** Keeps one change record; call inside the transaction that makes the change. */
export async function recordChange(tx: Tx, c: ChangeInput) {
	await tx.insert(changeRecords).values({
		venueId: c.venueId,
		propId: c.propId,
		sensorId: c.sensorId ?? null,
		outputId: c.outputId ?? null,
		part: c.part,
		partName: c.partName,
		summary: summarise(c.diffs),
		oldValue: c.oldValue,
		newValue: c.newValue,
		reason: c.reason,
		personId: c.personId
	});
}

/**
 * The change records that still ask for a re-test on a night: made before the night's doors open,
 * to one of the night's props, and not followed by another signed-off night with that prop.
 */
export async function openChanges(
	db: Reader,
	venueId: string,
	show: { id: string; doorsOpen: Date }
) {
	return db
		.select({
			id: changeRecords.id,
			propId: changeRecords.propId,
			propName: props.name,
			part: changeRecords.part,
			partName: changeRecords.partName,
			summary: changeRecords.summary,
			reason: changeRecords.reason,
			personName: users.name,
			at: changeRecords.at
		})
		.from(changeRecords)
		.innerJoin(props, eq(props.id, changeRecords.propId))
		.leftJoin(users, eq(users.id, changeRecords.personId))
		.where(
			and(
				eq(changeRecords.venueId, venueId),
				inArray(changeRecords.propId, nightPropIds(db, venueId, show.id)),
				lt(changeRecords.at, show.doorsOpen),
				sql`not exists (
					select 1 from ${signOffs}
					where ${signOffs.venueId} = ${venueId} and ${signOffs.at} > ${changeRecords.at}
						and ${signOffs.showId} <> ${show.id}
						and exists (select 1 from ${checks} where ${checks.showId} = ${signOffs.showId} and ${checks.propId} = ${changeRecords.propId})
				)`
			)
		)
		.orderBy(asc(changeRecords.at));
}

/** A prop's change records, newest first, for its page. */
export async function changesOfProp(db: Reader, venueId: string, propId: string, limit = 50) {
	return db
		.select({
			id: changeRecords.id,
			part: changeRecords.part,
			partName: changeRecords.partName,
			summary: changeRecords.summary,
			reason: changeRecords.reason,
			personName: users.name,
			at: changeRecords.at
		})
		.from(changeRecords)
		.leftJoin(users, eq(users.id, changeRecords.personId))
		.where(and(eq(changeRecords.venueId, venueId), eq(changeRecords.propId, propId)))
		.orderBy(desc(changeRecords.at))
		.limit(limit);
}
