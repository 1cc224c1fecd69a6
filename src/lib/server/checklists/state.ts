import { and, asc, eq, inArray, isNull } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import { arrivedLate, newestFirst } from '$lib/checklists/times';
import type { ChecklistView, CheckView, ResultView } from '$lib/checklists/view';
import { NO_ROOM } from '$lib/checklists/view';
import type { Db } from '$lib/server/db/client';
import {
	checkResults,
	checks,
	props,
	rooms,
	signOffs,
	standDownRestores,
	standDowns,
	users
} from '$lib/server/db/schema';

const restorer = alias(users, 'restorer');

const nameOf = (r: { name: string | null; email: string | null }) =>
	r.name ?? r.email ?? 'a former member';

/** A show's checklist as the pages and the API show it: each check with its latest result. */
export async function loadChecklist(
	db: Pick<Db, 'select'>,
	venue: { id: string; slug: string },
	showId: string
): Promise<ChecklistView> {
	const [checkRows, resultRows, downRows, [signed]] = await Promise.all([
		db
			.select({ check: checks, roomName: rooms.name, roomPos: rooms.position })
			.from(checks)
			.leftJoin(rooms, eq(rooms.id, checks.roomId))
			.where(and(eq(checks.showId, showId), eq(checks.venueId, venue.id), isNull(checks.removedAt)))
			.orderBy(asc(checks.sortKey)),
		db
			.select({ r: checkResults, name: users.name, email: users.email })
			.from(checkResults)
			.leftJoin(users, eq(users.id, checkResults.personId))
			.where(and(eq(checkResults.showId, showId), eq(checkResults.venueId, venue.id))),
		db
			.select({
				d: standDowns,
				propName: props.name,
				name: users.name,
				email: users.email,
				restore: standDownRestores,
				restorerName: restorer.name,
				restorerEmail: restorer.email
			})
			.from(standDowns)
			.innerJoin(props, eq(props.id, standDowns.propId))
			.leftJoin(users, eq(users.id, standDowns.personId))
			.leftJoin(standDownRestores, eq(standDownRestores.standDownId, standDowns.id))
			.leftJoin(restorer, eq(restorer.id, standDownRestores.personId))
			.where(and(eq(standDowns.showId, showId), eq(standDowns.venueId, venue.id)))
			.orderBy(asc(standDowns.at)),
		db
			.select({ s: signOffs, name: users.name, email: users.email })
			.from(signOffs)
			.leftJoin(users, eq(users.id, signOffs.personId))
			.where(and(eq(signOffs.showId, showId), eq(signOffs.venueId, venue.id)))
	]);
	const base = `/v/${venue.slug}/shows/${showId}/checklist/photos`;
	const unordered: ResultView[] = resultRows.map(({ r, name, email }) => ({
		id: r.id,
		checkId: r.checkId,
		outcome: r.outcome,
		idleReading: r.idleReading,
		presentReading: r.presentReading,
		note: r.note,
		photoUrl: r.photoKey ? `${base}/${r.id}` : null,
		personName: nameOf({ name, email }),
		recordedAt: r.recordedAt.toISOString(),
		receivedAt: r.receivedAt.toISOString(),
		clockSuspect: r.clockSuspect,
		fromBoard: r.fromBoard,
		boardReadAt: r.boardReadAt?.toISOString() ?? null,
		late: arrivedLate({
			recordedAt: r.recordedAt.toISOString(),
			receivedAt: r.receivedAt.toISOString(),
			clockSuspect: r.clockSuspect
		}),
		afterSignOff: r.afterSignOff
	}));
	const results = newestFirst(unordered);
	// A check's state is what was signed: late corrections are shown apart and change nothing.
	const latest = new Map<string, ResultView>();
	for (const r of results) if (!r.afterSignOff && !latest.has(r.checkId)) latest.set(r.checkId, r);
	const standing = downRows.filter((d) => d.restore === null);
	const down = new Set(standing.map((d) => d.d.propId));
	const list: CheckView[] = checkRows.map(({ check: c, roomName }) => ({
		id: c.id,
		key: c.key,
		kind: c.kind,
		propId: c.propId,
		roomId: c.roomId,
		roomName: roomName ?? NO_ROOM,
		label: c.label,
		detail: c.detail,
		required: c.required,
		expected: c.expected,
		latest: latest.get(c.id) ?? null,
		stoodDown: c.propId !== null && down.has(c.propId)
	}));
	const labels = new Map(checkRows.map(({ check }) => [check.id, check.label]));
	const missing = results.filter((r) => !labels.has(r.checkId)).map((r) => r.checkId);
	if (missing.length) {
		const gone = await db
			.select({ id: checks.id, label: checks.label })
			.from(checks)
			.where(inArray(checks.id, [...new Set(missing)]));
		for (const g of gone) labels.set(g.id, `${g.label} (no longer on tonight's list)`);
	}
	const history = results.map((r) => ({
		...r,
		label: labels.get(r.checkId) ?? 'A removed check'
	}));
	return {
		showId,
		checks: list,
		history,
		corrections: history.filter((r) => r.afterSignOff),
		standDowns: standing.map(({ d, propName, name, email }) => ({
			id: d.id,
			propId: d.propId,
			propName,
			reason: d.reason,
			personName: nameOf({ name, email }),
			at: d.at.toISOString()
		})),
		restored: downRows.flatMap(({ d, propName, name, email, restore, ...who }) =>
			restore
				? [
						{
							id: d.id,
							propId: d.propId,
							propName,
							reason: d.reason,
							personName: nameOf({ name, email }),
							at: d.at.toISOString(),
							restoreReason: restore.reason,
							restoredBy: nameOf({ name: who.restorerName, email: who.restorerEmail }),
							restoredAt: restore.at.toISOString()
						}
					]
				: []
		),
		signOff: signed
			? {
					personName: nameOf(signed),
					at: signed.s.at.toISOString(),
					note: signed.s.note,
					acknowledged: signed.s.acknowledged.map((a) => ({ key: a.key, message: a.message }))
				}
			: null
	};
}
