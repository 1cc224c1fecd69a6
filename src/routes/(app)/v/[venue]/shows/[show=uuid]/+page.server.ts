import { error, fail } from '@sveltejs/kit';
import { and, asc, eq, inArray } from 'drizzle-orm';
import { z } from 'zod';
import { nextDate, wallToInstant } from '$lib/schedule';
import { PLANNERS, requireRole } from '$lib/server/auth/guard';
import { audit } from '$lib/server/audit';
import { db } from '$lib/server/db';
import { isUniqueViolation } from '$lib/server/db/errors';
import {
	assignments,
	memberships,
	positions,
	props,
	rooms,
	scenes,
	seasons,
	showSceneExclusions,
	shows,
	signOffs,
	users
} from '$lib/server/db/schema';
import { notifyShow } from '$lib/server/checklists/live';
import { openChanges } from '$lib/server/changes/records';
import { crewProblemsOf, restoreStandDown, signOff } from '$lib/server/checklists/signoff';
import { currentChecklist } from '$lib/server/checklists/copies';
import { changesAfterSignOff, nightPropIds, scenesForShow } from '$lib/server/scenes/for-show';
import { restoreSchema, sceneExclusionSchema, signOffSchema } from '$lib/schemas/checklist';
import { stateOf } from '$lib/checklists/view';
import { keep, parseForm } from '$lib/server/forms';
import { getShow, listPositions, showAssignments, showConflicts } from '$lib/server/schedule/shows';
import {
	assignSchema,
	idSchema,
	reassignSchema,
	showStatusSchema,
	showTimesSchema
} from '$lib/schemas/schedule';
import { incidentCounts } from '$lib/server/incidents/records';
import { localTime } from '$lib/util/when';
import { noticeRunSheetChanges, runSheetDelivery } from '$lib/server/runsheets/send';
import { countHistory } from '$lib/server/wear/records';
import { guestCountSchema } from '$lib/schemas/wear';
import { groupsOf } from '$lib/wear/counters';
import { guestCounts } from '$lib/server/db/schema';
import type { Actions, PageServerLoad } from './$types';

/** Latest results the show page lists. */
const HISTORY_SHOWN = 12;

async function findShow(venueId: string, id: string) {
	if (!z.uuid().safeParse(id).success) return null;
	return getShow(db, venueId, id);
}

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event);
	const show = await findShow(venue.id, event.params.show);
	if (!show) error(404, 'There is no such show.');
	const person = event.locals.person!;
	const planner = PLANNERS.includes(venue.role);
	// Crew are let in only to their own shows: check that before reading the rest.
	const assigned = venue.role === 'crew' ? await showAssignments(db, venue.id, show.id) : null;
	if (assigned && !assigned.some((a) => a.personId === person.id)) {
		error(403, 'Crew see the shows they are assigned to, under My nights.');
	}
	const tz = venue.timeZone;
	const [
		here,
		[season],
		members,
		copy,
		night,
		left,
		roomRows,
		nightProps,
		positionList,
		conflicts,
		runSheets
	] = await Promise.all([
		assigned ?? showAssignments(db, venue.id, show.id),
		show.seasonId
			? db
					.select({ id: seasons.id, name: seasons.name })
					.from(seasons)
					.where(and(eq(seasons.id, show.seasonId), eq(seasons.venueId, venue.id)))
			: [],
		db
			.select({ id: users.id, name: users.name, email: users.email, role: memberships.role })
			.from(memberships)
			.innerJoin(users, eq(users.id, memberships.personId))
			.where(eq(memberships.venueId, venue.id))
			.orderBy(asc(users.name)),
		currentChecklist(db, venue, show.id),
		scenesForShow(db, venue.id, show.id),
		db
			.select({
				id: scenes.id,
				name: scenes.name,
				roomId: scenes.roomId,
				reason: showSceneExclusions.reason
			})
			.from(showSceneExclusions)
			.innerJoin(scenes, eq(scenes.id, showSceneExclusions.sceneId))
			.where(
				and(eq(showSceneExclusions.showId, show.id), eq(showSceneExclusions.venueId, venue.id))
			)
			.orderBy(asc(scenes.name)),
		db.select({ id: rooms.id, name: rooms.name }).from(rooms).where(eq(rooms.venueId, venue.id)),
		db
			.select({ id: props.id, name: props.name })
			.from(props)
			.where(
				and(eq(props.venueId, venue.id), inArray(props.id, nightPropIds(db, venue.id, show.id)))
			)
			.orderBy(asc(props.name)),
		listPositions(db, venue.id),
		showConflicts(db, venue.id, show.id, { show }),
		planner ? runSheetDelivery(db, venue.id, show.id) : null
	]);
	const countRows = await countHistory(db, venue.id, show.id);
	const checklist = copy.view;
	// The night's incidents page is for planners and whoever is on the night.
	const onNight = planner || here.some((a) => a.personId === person.id);
	const incidentCount = onNight
		? ((await incidentCounts(db, venue.id, [show.id])).get(show.id) ?? { total: 0, open: 0 })
		: null;
	const roomNames = new Map(roomRows.map((r) => [r.id, r.name]));
	const roomName = (id: string | null) => (id ? (roomNames.get(id) ?? null) : null);
	const [lateChanges, propChanges] = checklist.signOff
		? [await changesAfterSignOff(db, venue.id, show.id, new Date(checklist.signOff.at)), []]
		: [[], await openChanges(db, venue.id, show)];
	const down = new Set(checklist.standDowns.map((d) => d.propId));
	const failing = new Set(
		checklist.checks.filter((c) => c.latest?.outcome === 'fail' && c.propId).map((c) => c.propId)
	);
	return {
		// The page shows counts, the failing checks and the latest results, not every check.
		checklist: {
			...checklist,
			checks: checklist.checks.filter((c) => stateOf(c) === 'fail'),
			history: checklist.history.slice(0, HISTORY_SHOWN)
		},
		counts: copy.counts,
		progress: copy.progress,
		blockers: copy.blockers,
		scenes: night.map((s) => ({
			id: s.id,
			name: s.name,
			room: roomName(s.roomId),
			stoodDown: s.stoodDown
		})),
		leftOut: left.map((s) => ({ ...s, room: roomName(s.roomId) })),
		changedAfterSignOff: lateChanges.map((c) => ({ ...c, at: c.at.toISOString() })),
		// Changes to the night's props since their last signed-off night: each asks for a re-test.
		propChanges: propChanges.map((c) => ({ ...c, at: c.at.toISOString() })),
		// Only the failing props are offered here (a night can hold thousands of props); the
		// stand-down page finds any other by name.
		standDownChoices: nightProps.filter((p) => !down.has(p.id) && failing.has(p.id)),
		standDownOthers: nightProps.filter((p) => !down.has(p.id) && !failing.has(p.id)).length,
		show: {
			id: show.id,
			date: show.date,
			status: show.status,
			openingNight: show.openingNight,
			edited: show.edited,
			notes: show.notes,
			oneOff: show.seasonId === null,
			// Local HH:MM for the time inputs; the page writes them in the venue's clock.
			doorsOpen: localTime(show.doorsOpen, tz, '24h'),
			doorsClose: localTime(show.doorsClose, tz, '24h'),
			crewCall: localTime(show.crewCall, tz, '24h')
		},
		season: season ?? null,
		positions: positionList,
		assignments: here.map((a) => ({
			...a,
			call: localTime(a.callOverride ?? show.crewCall, tz, '24h'),
			overridden: a.callOverride !== null
		})),
		members: members.map((m) => ({ id: m.id, name: m.name ?? m.email })),
		conflicts,
		crewProblems: checklist.signOff ? [] : crewProblemsOf(conflicts),
		canEdit: planner,
		runSheets,
		incidents: incidentCount,
		// Newest first; the first is the night's count, the rest are what it corrected.
		guestCounts: countRows.slice(0, 6).map((c) => ({
			...c,
			groupsWorked: groupsOf(c),
			at: c.at.toISOString()
		}))
	};
};

async function isSigned(showId: string) {
	const [row] = await db
		.select({ id: signOffs.id })
		.from(signOffs)
		.where(eq(signOffs.showId, showId));
	return Boolean(row);
}

async function markEdited(
	showId: string,
	venueId: string,
	personId: string,
	set: Partial<typeof shows.$inferInsert>
) {
	const [current] = await db
		.select({ sequence: shows.sequence })
		.from(shows)
		.where(and(eq(shows.id, showId), eq(shows.venueId, venueId)));
	if (!current) return false;
	await db
		.update(shows)
		.set({
			...set,
			edited: true,
			editedAt: new Date(),
			editedBy: personId,
			sequence: current.sequence + 1
		})
		.where(and(eq(shows.id, showId), eq(shows.venueId, venueId)));
	return true;
}

export const actions: Actions = {
	times: async (event) => {
		const venue = requireRole(event, ...PLANNERS);
		const show = await findShow(venue.id, event.params.show);
		if (!show) return fail(404, { action: 'times', message: 'That show no longer exists.' });
		const parsed = await parseForm(event.request, showTimesSchema);
		if (!parsed.ok)
			return fail(400, { action: 'times', values: keep(parsed.raw), errors: parsed.errors });
		const { doorsOpen, doorsClose, crewCall, notes } = parsed.data;
		const tz = venue.timeZone;
		const open = wallToInstant(show.date, doorsOpen, tz);
		if (doorsClose === doorsOpen) {
			return fail(400, {
				action: 'times',
				values: keep(parsed.raw),
				errors: { doorsClose: ['Doors open and close at the same time.'] }
			});
		}
		const close = wallToInstant(
			doorsClose < doorsOpen ? nextDate(show.date) : show.date,
			doorsClose,
			tz
		);
		const call = wallToInstant(show.date, crewCall, tz);
		if (call > open) {
			return fail(400, {
				action: 'times',
				values: keep(parsed.raw),
				errors: { crewCall: ['Crew call must be at or before doors open.'] }
			});
		}
		await markEdited(show.id, venue.id, event.locals.person!.id, {
			doorsOpen: open,
			doorsClose: close,
			crewCall: call,
			notes
		});
		await audit(db, {
			venueId: venue.id,
			personId: event.locals.person!.id,
			action: 'show.changed',
			detail: { show: show.id, date: show.date, doorsOpen, doorsClose, crewCall }
		});
		await noticeRunSheetChanges(db, venue.id, show.id, event);
		return { action: 'times', saved: true };
	},
	status: async (event) => {
		const venue = requireRole(event, ...PLANNERS);
		const show = await findShow(venue.id, event.params.show);
		if (!show) return fail(404, { action: 'status', message: 'That show no longer exists.' });
		const parsed = await parseForm(event.request, showStatusSchema);
		if (!parsed.ok) return fail(400, { action: 'status', message: 'Pick a status.' });
		await markEdited(show.id, venue.id, event.locals.person!.id, { status: parsed.data.status });
		await audit(db, {
			venueId: venue.id,
			personId: event.locals.person!.id,
			action: 'show.status',
			detail: { show: show.id, date: show.date, status: parsed.data.status }
		});
		await noticeRunSheetChanges(db, venue.id, show.id, event);
		return { action: 'status', saved: true };
	},
	assign: async (event) => {
		const venue = requireRole(event, ...PLANNERS);
		const show = await findShow(venue.id, event.params.show);
		if (!show) return fail(404, { action: 'assign', message: 'That show no longer exists.' });
		const parsed = await parseForm(event.request, assignSchema);
		if (!parsed.ok)
			return fail(400, { action: 'assign', values: keep(parsed.raw), errors: parsed.errors });
		const { positionId, personId, call } = parsed.data;
		const posts = await listPositions(db, venue.id);
		const post = posts.find((p) => p.id === positionId);
		if (!post)
			return fail(400, {
				action: 'assign',
				values: keep(parsed.raw),
				errors: { positionId: ['Pick a position.'] }
			});
		const [member] = await db
			.select({ id: memberships.id })
			.from(memberships)
			.where(and(eq(memberships.venueId, venue.id), eq(memberships.personId, personId)));
		if (!member)
			return fail(400, {
				action: 'assign',
				values: keep(parsed.raw),
				errors: { personId: ['Pick a member of this venue.'] }
			});
		let callOverride: Date | null = null;
		if (call) {
			callOverride = wallToInstant(show.date, call, venue.timeZone);
			if (callOverride >= show.doorsClose) {
				return fail(400, {
					action: 'assign',
					values: keep(parsed.raw),
					errors: { call: ['The call must be before doors close.'] }
				});
			}
		}
		const done = await db
			.insert(assignments)
			.values({ venueId: venue.id, showId: show.id, positionId, personId, callOverride })
			.onConflictDoUpdate({
				target: [assignments.showId, assignments.positionId, assignments.personId],
				set: { callOverride }
			})
			.returning();
		await audit(db, {
			venueId: venue.id,
			personId: event.locals.person!.id,
			action: 'show.assigned',
			detail: {
				show: show.id,
				date: show.date,
				position: post.name,
				person: personId,
				assignment: done[0].id
			}
		});
		await noticeRunSheetChanges(db, venue.id, show.id, event);
		return { action: 'assign', saved: true };
	},
	reassign: async (event) => {
		const venue = requireRole(event, ...PLANNERS);
		const show = await findShow(venue.id, event.params.show);
		if (!show) return fail(404, { action: 'reassign', message: 'That show no longer exists.' });
		const parsed = await parseForm(event.request, reassignSchema);
		const id = typeof parsed.raw.id === 'string' ? parsed.raw.id : '';
		if (!parsed.ok)
			return fail(400, { action: 'reassign', id, values: keep(parsed.raw), errors: parsed.errors });
		const { positionId, call } = parsed.data;
		const post = (await listPositions(db, venue.id)).find((p) => p.id === positionId);
		if (!post)
			return fail(400, {
				action: 'reassign',
				id,
				values: keep(parsed.raw),
				errors: { positionId: ['Pick a position.'] }
			});
		const callOverride = call ? wallToInstant(show.date, call, venue.timeZone) : null;
		if (callOverride && callOverride >= show.doorsClose)
			return fail(400, {
				action: 'reassign',
				id,
				values: keep(parsed.raw),
				errors: { call: ['The call must be before doors close.'] }
			});
		let done;
		try {
			done = await db
				.update(assignments)
				.set({ positionId, callOverride })
				.where(
					and(
						eq(assignments.id, parsed.data.id),
						eq(assignments.venueId, venue.id),
						eq(assignments.showId, show.id)
					)
				)
				.returning();
		} catch (e) {
			if (!isUniqueViolation(e)) throw e;
			return fail(400, {
				action: 'reassign',
				id,
				values: keep(parsed.raw),
				errors: { positionId: [`They are already assigned as ${post.name} on this show.`] }
			});
		}
		if (!done.length)
			return fail(404, { action: 'reassign', id, message: 'That assignment no longer exists.' });
		await audit(db, {
			venueId: venue.id,
			personId: event.locals.person!.id,
			action: 'show.assigned',
			detail: {
				show: show.id,
				date: show.date,
				position: post.name,
				person: done[0].personId,
				assignment: done[0].id
			}
		});
		await noticeRunSheetChanges(db, venue.id, show.id, event);
		return { action: 'reassign', id, saved: true };
	},
	unassign: async (event) => {
		const venue = requireRole(event, ...PLANNERS);
		const parsed = await parseForm(event.request, idSchema);
		if (!parsed.ok)
			return fail(400, { action: 'unassign', message: 'That assignment no longer exists.' });
		const done = await db
			.delete(assignments)
			.where(and(eq(assignments.id, parsed.data.id), eq(assignments.venueId, venue.id)))
			.returning();
		if (!done.length)
			return fail(404, { action: 'unassign', message: 'That assignment no longer exists.' });
		const [post] = await db
			.select({ name: positions.name })
			.from(positions)
			.where(eq(positions.id, done[0].positionId));
		await audit(db, {
			venueId: venue.id,
			personId: event.locals.person!.id,
			action: 'show.unassigned',
			detail: { show: done[0].showId, person: done[0].personId, position: post?.name }
		});
		await noticeRunSheetChanges(db, venue.id, done[0].showId, event);
		return { action: 'unassign', saved: true };
	},
	exclude: async (event) => {
		const venue = requireRole(event, ...PLANNERS);
		const show = await findShow(venue.id, event.params.show);
		if (!show) return fail(404, { action: 'exclude', message: 'That show no longer exists.' });
		const parsed = await parseForm(event.request, sceneExclusionSchema);
		if (!parsed.ok) return fail(400, { action: 'exclude', message: 'Pick a scene.' });
		if (await isSigned(show.id))
			return fail(409, {
				action: 'exclude',
				message: 'This night is signed off; its scenes are fixed.'
			});
		const [scene] = await db
			.select({ id: scenes.id, name: scenes.name })
			.from(scenes)
			.where(and(eq(scenes.id, parsed.data.sceneId), eq(scenes.venueId, venue.id)));
		if (!scene) return fail(404, { action: 'exclude', message: 'That scene no longer exists.' });
		await db
			.insert(showSceneExclusions)
			.values({ showId: show.id, sceneId: scene.id, venueId: venue.id, reason: parsed.data.reason })
			.onConflictDoNothing();
		await audit(db, {
			venueId: venue.id,
			personId: event.locals.person!.id,
			action: 'show.scene_left_out',
			detail: { show: show.id, date: show.date, scene: scene.name }
		});
		await notifyShow(db, show.id);
		await noticeRunSheetChanges(db, venue.id, show.id, event);
		return { action: 'exclude', saved: true };
	},
	include: async (event) => {
		const venue = requireRole(event, ...PLANNERS);
		const show = await findShow(venue.id, event.params.show);
		if (!show) return fail(404, { action: 'include', message: 'That show no longer exists.' });
		const parsed = await parseForm(event.request, sceneExclusionSchema);
		if (!parsed.ok) return fail(400, { action: 'include', message: 'Pick a scene.' });
		if (await isSigned(show.id))
			return fail(409, {
				action: 'include',
				message: 'This night is signed off; its scenes are fixed.'
			});
		const done = await db
			.delete(showSceneExclusions)
			.where(
				and(
					eq(showSceneExclusions.showId, show.id),
					eq(showSceneExclusions.sceneId, parsed.data.sceneId),
					eq(showSceneExclusions.venueId, venue.id)
				)
			)
			.returning();
		if (!done.length)
			return fail(404, { action: 'include', message: 'That scene is already in this night.' });
		await audit(db, {
			venueId: venue.id,
			personId: event.locals.person!.id,
			action: 'show.scene_put_back',
			detail: { show: show.id, date: show.date, scene: parsed.data.sceneId }
		});
		await notifyShow(db, show.id);
		await noticeRunSheetChanges(db, venue.id, show.id, event);
		return { action: 'include', saved: true };
	},
	restore: async (event) => {
		const venue = requireRole(event, ...PLANNERS);
		const show = await findShow(venue.id, event.params.show);
		if (!show) return fail(404, { action: 'restore', message: 'That show no longer exists.' });
		const parsed = await parseForm(event.request, restoreSchema);
		if (!parsed.ok)
			return fail(400, { action: 'restore', values: keep(parsed.raw), errors: parsed.errors });
		const done = await restoreStandDown(db, venue, show.id, event.locals.person!.id, parsed.data);
		if (!done.ok)
			return fail(400, {
				action: 'restore',
				values: keep(parsed.raw),
				errors: { reason: [done.message] }
			});
		await noticeRunSheetChanges(db, venue.id, show.id, event);
		return { action: 'restore', saved: true, propName: done.propName };
	},
	signOff: async (event) => {
		const venue = requireRole(event, ...PLANNERS);
		const show = await findShow(venue.id, event.params.show);
		if (!show) return fail(404, { action: 'signOff', message: 'That show no longer exists.' });
		const parsed = await parseForm(event.request, signOffSchema);
		if (!parsed.ok)
			return fail(400, { action: 'signOff', values: keep(parsed.raw), errors: parsed.errors });
		const done = await signOff(
			db,
			venue,
			show.id,
			event.locals.person!.id,
			parsed.data.note,
			parsed.data.ack
		);
		if (!done.ok)
			return fail(400, {
				action: 'signOff',
				values: keep(parsed.raw, 'ack'),
				refused: done.message,
				blockers: done.blockers,
				unacknowledged: done.unacknowledged?.map((p) => p.key) ?? []
			});
		return { action: 'signOff', saved: true };
	},
	guests: async (event) => {
		const venue = requireRole(event, ...PLANNERS);
		const show = await findShow(venue.id, event.params.show);
		if (!show) return fail(404, { action: 'guests', message: 'That show no longer exists.' });
		const parsed = await parseForm(event.request, guestCountSchema);
		if (!parsed.ok)
			return fail(400, { action: 'guests', values: keep(parsed.raw), errors: parsed.errors });
		const { guests, groupsBy, groupValue } = parsed.data;
		// Append-only: a correction is a new row, and the latest row is the night's count.
		await db.insert(guestCounts).values({
			venueId: venue.id,
			showId: show.id,
			guests,
			groupSize: groupsBy === 'size' ? groupValue : null,
			groups: groupsBy === 'count' ? groupValue : null,
			personId: event.locals.person!.id
		});
		return { action: 'guests', saved: true };
	}
};
