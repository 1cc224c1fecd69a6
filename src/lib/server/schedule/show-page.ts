/**
 * The show page's reads and the work of its actions. The route checks the role, finds the show and
 * parses the form; these functions read or change the night and say in people's words what was
 * refused, keyed by the field it belongs beside.
 */
import { and, asc, eq, inArray } from 'drizzle-orm';
import { nextDate, wallToInstant } from '$lib/schedule';
import { audit } from '$lib/server/audit';
import type { Db } from '$lib/server/db/client';
import { isUniqueViolation } from '$lib/server/db/errors';
import {
	assignments,
	guestCounts,
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
import type { VenueContext } from '$lib/server/auth/types';
import { openChanges } from '$lib/server/changes/records';
import { currentChecklist } from '$lib/server/checklists/copies';
import { notifyShow } from '$lib/server/checklists/live';
import { crewProblemsOf } from '$lib/server/checklists/signoff';
import { incidentCounts } from '$lib/server/incidents/records';
import { runSheetDelivery } from '$lib/server/runsheets/send';
import { changesAfterSignOff, nightPropIds, scenesForShow } from '$lib/server/scenes/for-show';
import { countHistory } from '$lib/server/wear/records';
import { stateOf } from '$lib/checklists/view';
import { localTime } from '$lib/util/when';
import { groupsOf } from '$lib/wear/counters';
import { listPositions, showAssignments, showConflicts } from './shows';

/** Latest results the show page lists. */
const HISTORY_SHOWN = 12;

type Show = typeof shows.$inferSelect;
type Assigned = Awaited<ReturnType<typeof showAssignments>>;

/** A refusal: either beside a field (`errors`) or for the whole form (`message`, with a status). */
export type Refused =
	{ ok: false; errors: Record<string, string[]> } | { ok: false; status: number; message: string };
type Done<T = object> = ({ ok: true } & T) | Refused;

const beside = (field: string, message: string): Refused => ({
	ok: false,
	errors: { [field]: [message] }
});
const refuse = (status: number, message: string): Refused => ({ ok: false, status, message });

/**
 * Everything the show page shows. `assigned` is the night's assignments when the caller has
 * already read them (to let crew in only to their own shows).
 */
export async function showPageData(
	db: Db,
	venue: VenueContext,
	personId: string,
	show: Show,
	planner: boolean,
	assigned: Assigned | null
) {
	const tz = venue.timeZone;
	// Whether the person is on the night is known before reading when they are a planner, or crew
	// already let in by their assignment; only then can the incident counts be read alongside.
	const onNightKnown = planner || assigned !== null;
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
		runSheets,
		countRows,
		earlyIncidents
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
		planner ? runSheetDelivery(db, venue.id, show.id) : null,
		countHistory(db, venue.id, show.id),
		onNightKnown ? incidentCounts(db, venue.id, [show.id]) : null
	]);
	const checklist = copy.view;
	// The night's incidents page is for planners and whoever is on the night.
	const onNight = planner || here.some((a) => a.personId === personId);
	const [incidents, lateChanges, propChanges] = await Promise.all([
		earlyIncidents ?? (onNight ? incidentCounts(db, venue.id, [show.id]) : null),
		checklist.signOff
			? changesAfterSignOff(db, venue.id, show.id, new Date(checklist.signOff.at))
			: [],
		checklist.signOff ? [] : openChanges(db, venue.id, show)
	]);
	const incidentCount = onNight ? (incidents?.get(show.id) ?? { total: 0, open: 0 }) : null;
	const roomNames = new Map(roomRows.map((r) => [r.id, r.name]));
	const roomName = (id: string | null) => (id ? (roomNames.get(id) ?? null) : null);
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
}

async function isSigned(db: Db, showId: string) {
	const [row] = await db
		.select({ id: signOffs.id })
		.from(signOffs)
		.where(eq(signOffs.showId, showId));
	return Boolean(row);
}

/** Saves a hand edit to a show: marks it edited and bumps its sequence for calendar feeds. */
async function markEdited(
	db: Db,
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

/** New doors and crew-call times (local HH:MM) and notes for one night. */
export async function saveShowTimes(
	db: Db,
	venue: VenueContext,
	personId: string,
	show: Show,
	input: { doorsOpen: string; doorsClose: string; crewCall: string; notes: string | null }
): Promise<Done> {
	const { doorsOpen, doorsClose, crewCall, notes } = input;
	const tz = venue.timeZone;
	const open = wallToInstant(show.date, doorsOpen, tz);
	if (doorsClose === doorsOpen)
		return beside('doorsClose', 'Doors open and close at the same time.');
	const close = wallToInstant(
		doorsClose < doorsOpen ? nextDate(show.date) : show.date,
		doorsClose,
		tz
	);
	const call = wallToInstant(show.date, crewCall, tz);
	if (call > open) return beside('crewCall', 'Crew call must be at or before doors open.');
	await markEdited(db, show.id, venue.id, personId, {
		doorsOpen: open,
		doorsClose: close,
		crewCall: call,
		notes
	});
	await audit(db, {
		venueId: venue.id,
		personId,
		action: 'show.changed',
		detail: { show: show.id, date: show.date, doorsOpen, doorsClose, crewCall }
	});
	return { ok: true };
}

export async function saveShowStatus(
	db: Db,
	venue: VenueContext,
	personId: string,
	show: Show,
	status: Show['status']
) {
	await markEdited(db, show.id, venue.id, personId, { status });
	await audit(db, {
		venueId: venue.id,
		personId,
		action: 'show.status',
		detail: { show: show.id, date: show.date, status }
	});
}

/** A call override as an instant, refused when it is not before doors close. */
function callOf(show: Show, call: string | null | undefined, tz: string) {
	const at = call ? wallToInstant(show.date, call, tz) : null;
	return at && at >= show.doorsClose ? 'late' : at;
}

/** Puts a member on a position for the night (or changes their call if they already are). */
export async function assignCrew(
	db: Db,
	venue: VenueContext,
	personId: string,
	show: Show,
	input: { positionId: string; personId: string; call?: string | null }
): Promise<Done> {
	const posts = await listPositions(db, venue.id);
	const post = posts.find((p) => p.id === input.positionId);
	if (!post) return beside('positionId', 'Pick a position.');
	const [member] = await db
		.select({ id: memberships.id })
		.from(memberships)
		.where(and(eq(memberships.venueId, venue.id), eq(memberships.personId, input.personId)));
	if (!member) return beside('personId', 'Pick a member of this venue.');
	const callOverride = callOf(show, input.call, venue.timeZone);
	if (callOverride === 'late') return beside('call', 'The call must be before doors close.');
	const done = await db
		.insert(assignments)
		.values({
			venueId: venue.id,
			showId: show.id,
			positionId: input.positionId,
			personId: input.personId,
			callOverride
		})
		.onConflictDoUpdate({
			target: [assignments.showId, assignments.positionId, assignments.personId],
			set: { callOverride }
		})
		.returning();
	await audit(db, {
		venueId: venue.id,
		personId,
		action: 'show.assigned',
		detail: {
			show: show.id,
			date: show.date,
			position: post.name,
			person: input.personId,
			assignment: done[0].id
		}
	});
	return { ok: true };
}

/** Moves an assignment to another position or call. */
export async function reassignCrew(
	db: Db,
	venue: VenueContext,
	personId: string,
	show: Show,
	input: { id: string; positionId: string; call?: string | null }
): Promise<Done> {
	const post = (await listPositions(db, venue.id)).find((p) => p.id === input.positionId);
	if (!post) return beside('positionId', 'Pick a position.');
	const callOverride = callOf(show, input.call, venue.timeZone);
	if (callOverride === 'late') return beside('call', 'The call must be before doors close.');
	let done;
	try {
		done = await db
			.update(assignments)
			.set({ positionId: input.positionId, callOverride })
			.where(
				and(
					eq(assignments.id, input.id),
					eq(assignments.venueId, venue.id),
					eq(assignments.showId, show.id)
				)
			)
			.returning();
	} catch (e) {
		if (!isUniqueViolation(e)) throw e;
		return beside('positionId', `They are already assigned as ${post.name} on this show.`);
	}
	if (!done.length) return refuse(404, 'That assignment no longer exists.');
	await audit(db, {
		venueId: venue.id,
		personId,
		action: 'show.assigned',
		detail: {
			show: show.id,
			date: show.date,
			position: post.name,
			person: done[0].personId,
			assignment: done[0].id
		}
	});
	return { ok: true };
}

/** Takes someone off the night; answers the show they were on. */
export async function unassignCrew(
	db: Db,
	venue: VenueContext,
	personId: string,
	id: string
): Promise<Done<{ showId: string }>> {
	const done = await db
		.delete(assignments)
		.where(and(eq(assignments.id, id), eq(assignments.venueId, venue.id)))
		.returning();
	if (!done.length) return refuse(404, 'That assignment no longer exists.');
	const [post] = await db
		.select({ name: positions.name })
		.from(positions)
		.where(eq(positions.id, done[0].positionId));
	await audit(db, {
		venueId: venue.id,
		personId,
		action: 'show.unassigned',
		detail: { show: done[0].showId, person: done[0].personId, position: post?.name }
	});
	return { ok: true, showId: done[0].showId };
}

const SIGNED = 'This night is signed off; its scenes are fixed.';

/** Leaves a scene out of this night (not once signed off). */
export async function leaveSceneOut(
	db: Db,
	venue: VenueContext,
	personId: string,
	show: Show,
	input: { sceneId: string; reason: string | null }
): Promise<Done> {
	if (await isSigned(db, show.id)) return refuse(409, SIGNED);
	const [scene] = await db
		.select({ id: scenes.id, name: scenes.name })
		.from(scenes)
		.where(and(eq(scenes.id, input.sceneId), eq(scenes.venueId, venue.id)));
	if (!scene) return refuse(404, 'That scene no longer exists.');
	await db
		.insert(showSceneExclusions)
		.values({ showId: show.id, sceneId: scene.id, venueId: venue.id, reason: input.reason })
		.onConflictDoNothing();
	await audit(db, {
		venueId: venue.id,
		personId,
		action: 'show.scene_left_out',
		detail: { show: show.id, date: show.date, scene: scene.name }
	});
	await notifyShow(db, show.id);
	return { ok: true };
}

/** Puts a left-out scene back into this night (not once signed off). */
export async function putSceneBack(
	db: Db,
	venue: VenueContext,
	personId: string,
	show: Show,
	sceneId: string
): Promise<Done> {
	if (await isSigned(db, show.id)) return refuse(409, SIGNED);
	const done = await db
		.delete(showSceneExclusions)
		.where(
			and(
				eq(showSceneExclusions.showId, show.id),
				eq(showSceneExclusions.sceneId, sceneId),
				eq(showSceneExclusions.venueId, venue.id)
			)
		)
		.returning();
	if (!done.length) return refuse(404, 'That scene is already in this night.');
	await audit(db, {
		venueId: venue.id,
		personId,
		action: 'show.scene_put_back',
		detail: { show: show.id, date: show.date, scene: sceneId }
	});
	await notifyShow(db, show.id);
	return { ok: true };
}

/** Records the night's guest count. Append-only: a correction is a new row, the latest counts. */
export async function recordGuestCount(
	db: Db,
	venue: VenueContext,
	personId: string,
	show: Show,
	input: { guests: number; groupsBy: 'size' | 'count'; groupValue: number }
) {
	await db.insert(guestCounts).values({
		venueId: venue.id,
		showId: show.id,
		guests: input.guests,
		groupSize: input.groupsBy === 'size' ? input.groupValue : null,
		groups: input.groupsBy === 'count' ? input.groupValue : null,
		personId
	});
}
