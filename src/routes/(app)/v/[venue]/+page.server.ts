import { asc, count, eq } from 'drizzle-orm';
import { requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { memberships, rooms, venues } from '$lib/server/db/schema';
import { telHref } from '$lib/util/tel';
import {
	nextShow,
	showAssignments,
	showConflicts,
	listPositions
} from '$lib/server/schedule/shows';
import { localTime } from '$lib/util/when';
import { currentChecklist } from '$lib/server/checklists/copies';
import { runSheetDelivery } from '$lib/server/runsheets/send';
import { listFaults } from '$lib/server/faults/records';
import { maintenanceWorkItems } from '$lib/server/wear/records';
import { UNHEARD_MINUTES, quietBoards } from '$lib/server/boards/live';
import { baselineAlerts, type BaselineAlert } from '$lib/server/boards/baselines';
import { localDateTime } from '$lib/util/when';
import { openIncidentCount } from '$lib/server/incidents/records';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event);
	const planner = venue.role === 'owner' || venue.role === 'show_manager';
	const [[details], roomList, [members], show, openFaults, quiet, maintenance] = await Promise.all([
		db.select().from(venues).where(eq(venues.id, venue.id)),
		db
			.select({ id: rooms.id, name: rooms.name })
			.from(rooms)
			.where(eq(rooms.venueId, venue.id))
			.orderBy(asc(rooms.position), asc(rooms.name)),
		db.select({ n: count() }).from(memberships).where(eq(memberships.venueId, venue.id)),
		nextShow(db, venue.id),
		listFaults(db, venue.id, { openOnly: true }),
		quietBoards(db, venue.id),
		maintenanceWorkItems(db, venue.id)
	]);
	let next = null;
	let drifting: BaselineAlert[] = [];
	if (show) {
		const summary = async () => {
			const copy = await currentChecklist(db, venue, show.id);
			return {
				total: copy.counts.total,
				pass: copy.counts.pass,
				fail: copy.counts.fail,
				rooms: copy.progress,
				signedBy: copy.view.signOff?.personName ?? null
			};
		};
		const scheduled = show.status === 'scheduled';
		// Everything about the night at once. Owners and show managers may open every show, so
		// their summary and incident count are read alongside the rest; crew's wait for the crew
		// list, which says whether they work the night.
		const [crew, posts, delivery, conflicts, plannerChecklist, plannerIncidents, drift] =
			await Promise.all([
				showAssignments(db, venue.id, show.id),
				listPositions(db, venue.id),
				planner ? runSheetDelivery(db, venue.id, show.id) : null,
				venue.role === 'crew' ? [] : showConflicts(db, venue.id, show.id, { show }),
				planner && scheduled ? summary() : null,
				planner ? openIncidentCount(db, venue.id, show.id) : null,
				scheduled ? baselineAlerts(db, venue.id, show) : []
			]);
		drifting = drift;
		const mine = crew.filter((a) => a.personId === event.locals.person!.id);
		const canOpen = planner || mine.length > 0;
		const works = !planner && canOpen;
		const [crewChecklist, crewIncidents] = works
			? await Promise.all([scheduled ? summary() : null, openIncidentCount(db, venue.id, show.id)])
			: [null, null];
		const checklist = plannerChecklist ?? crewChecklist;
		// The night's open incidents, for those who may open its incidents page.
		const openIncidents = planner ? plannerIncidents : crewIncidents;
		// Every post the person has on the night, earliest call first (no extra read: the crew and
		// positions are loaded above).
		const myCalls = mine
			.map((a) => {
				const post = posts.find((p) => p.id === a.positionId);
				return {
					at: a.callOverride ?? show.crewCall,
					position: post?.name ?? 'A position',
					room: post?.roomName ?? null
				};
			})
			.sort((a, b) => a.at.getTime() - b.at.getTime() || a.position.localeCompare(b.position))
			.map((c) => ({
				position: c.position,
				room: c.room,
				call: localTime(c.at, venue.timeZone, venue.clock)
			}));
		next = {
			checklist,
			runSheets: delivery
				? { sent: delivery.sent, failed: delivery.failed, total: delivery.total }
				: null,
			id: show.id,
			date: show.date,
			status: show.status,
			openingNight: show.openingNight,
			crewCall: localTime(show.crewCall, venue.timeZone, venue.clock),
			doorsOpen: localTime(show.doorsOpen, venue.timeZone, venue.clock),
			doorsClose: localTime(show.doorsClose, venue.timeZone, venue.clock),
			assigned: crew.length,
			positions: posts.length,
			myCalls,
			problems: conflicts.length,
			canOpen: venue.role !== 'crew' || mine.length > 0,
			canCheck: canOpen,
			openIncidents
		};
	}
	return {
		details,
		safetyTel: telHref(details.safetyContactPhone),
		rooms: roomList,
		memberCount: members.n,
		next,
		quietBoards: {
			minutes: UNHEARD_MINUTES,
			boards: quiet.map((b) => ({
				id: b.controllerId,
				name: b.name,
				lastHeard: b.lastAt ? localDateTime(b.lastAt, venue.timeZone, venue.clock) : null
			}))
		},
		/** Sensors whose idle baseline tonight is outside its band or heading there. */
		drifting: drifting.map((d) => ({
			sensorId: d.sensorId,
			propId: d.propId,
			name: `${d.propName}: ${d.sensorName}`,
			state: d.state,
			words: d.words
		})),
		maintenance,
		openFaults: openFaults.map((f) => ({
			id: f.id,
			propId: f.propId,
			propName: f.propName,
			roomName: f.roomName,
			severity: f.severity,
			seen: f.seen,
			state: f.state,
			downtimeMinutes: f.downtimeMinutes
		}))
	};
};
