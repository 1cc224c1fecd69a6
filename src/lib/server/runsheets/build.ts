import { createHash } from 'node:crypto';
import { listFaults } from '$lib/server/faults/records';
import { SEVERITY_WORDS } from '$lib/faults/downtime';
import { and, asc, eq } from 'drizzle-orm';
import type { RunSheetData, RunSheetScene, RunSheetWarning } from '$lib/runsheets/sheet';
import { hazardsOf } from '$lib/props/output-maths';
import { cueLine, responseLine } from '$lib/runsheets/cues';
import type { SheetSummary } from '$lib/runsheets/changes';
import { checkScene, needsStrobeSignage } from '$lib/scenes/checks';
import type { Db } from '$lib/server/db/client';
import {
	assignments,
	memberships,
	positions,
	rooms,
	shows,
	users,
	venues
} from '$lib/server/db/schema';
import { loadNight } from '$lib/server/scenes/night';
import { luminanceThroughCurves } from '$lib/server/scenes/model';
import { checklistSpecs } from '$lib/server/checklists/sync';
import { localDay, localTime } from '$lib/util/when';

export type Show = typeof shows.$inferSelect;
export type Venue = typeof venues.$inferSelect;

/** Gloaming's show-stop steps, the same at every venue. */
export const SHOW_STOP = [
	'Press the nearest stop button: effects go to their safe state, lights come up full, valves and fog go off.',
	'Call "show stop" on the radio and say which room.',
	'Guide guests to the nearest lit exit; do not restart until the show manager or safety lead says so.'
];

const STATUS_WORDS = { scheduled: 'Scheduled', cancelled: 'Cancelled', dark: 'Dark' } as const;

/** One person's run sheet for one show, with what is needed to send it and to tell changes. */
export interface PersonRunSheet {
	personId: string;
	email: string;
	name: string;
	callAt: Date;
	data: RunSheetData;
	summary: SheetSummary;
	/** Hash of everything the sheet says (not its link): equal hashes, nothing to send. */
	contentHash: string;
}

export interface ShowRunSheets {
	venue: Venue;
	show: Show;
	sheets: PersonRunSheet[];
}

export function runSheetUrl(origin: string, slug: string, showId: string, personId: string) {
	return new URL(`/v/${slug}/shows/${showId}/run-sheets/${personId}`, origin).toString();
}

/** A short hash of what a sheet says (its link and change list left out) and the show's status. */
export function hashContent(data: RunSheetData, status: string): string {
	const { url: _url, changes: _changes, ...content } = data;
	return createHash('sha256')
		.update(JSON.stringify({ content, status }))
		.digest('hex')
		.slice(0, 16);
}

/** Build the sheets as they would read after a change not yet made (for previews). */
export interface WhatIf {
	assumeDown?: { propId: string; reason: string };
}

/** The scenes of a show with their cues and safety notes, each with its room. */
async function sceneSheets(db: Db, venue: Venue, showId: string, what: WhatIf) {
	const [night, roomRows] = await Promise.all([
		loadNight(db, venue.id, showId),
		db.select({ id: rooms.id, name: rooms.name }).from(rooms).where(eq(rooms.venueId, venue.id))
	]);
	if (night.scenes.length === 0) return [];
	const roomName = new Map(roomRows.map((r) => [r.id, r.name]));
	const propName = new Map(night.props.map((p) => [p.id, p.name]));
	const sensorName = new Map(night.sensors.map((x) => [x.id, x.name]));
	const downReason = new Map(night.standDowns.map((d) => [d.propId, d.reason]));
	if (what.assumeDown) downReason.set(what.assumeDown.propId, what.assumeDown.reason);

	const out: (RunSheetScene & {
		roomId: string | null;
		stoodDownProps: string[];
		stoodDownPropIds: string[];
	})[] = [];
	for (const s of night.scenes) {
		const outputById = new Map(s.outputRows.map((o) => [o.id, o]));
		const cues = [
			...s.responses.map((r) =>
				responseLine(
					outputById.get(r.outputId)?.name ?? 'an output',
					sensorName.get(r.sensorId) ?? 'a sensor'
				)
			),
			...s.cues.map((c) => {
				const o = outputById.get(c.outputId);
				return cueLine(c.startMs, c.action, {
					name: o?.name ?? 'an output',
					kind: o?.kind === 'relay' ? 'relay' : 'led'
				});
			})
		];

		const warnings: RunSheetWarning[] = [];
		const hazards = new Set(s.outputRows.flatMap((o) => hazardsOf(o)));
		const findings = checkScene(s.scene, s.outputs, {
			luminance: luminanceThroughCurves(s.outputRows)
		});
		const flashing = findings.some((f) => f.code === 'flash-rate');
		if (hazards.has('strobe') || needsStrobeSignage(findings))
			warnings.push({
				kind: 'strobe',
				...(flashing ? { note: 'flashes more than 3 times a second' } : {})
			});
		if (hazards.has('fog')) warnings.push({ kind: 'fog' });
		if (hazards.has('pneumatics')) warnings.push({ kind: 'pneumatics' });
		if (hazards.has('mains-powered load')) warnings.push({ kind: 'mains' });
		const stoodDownProps: string[] = [];
		const stoodDownPropIds: string[] = [];
		for (const propId of s.propIds) {
			const reason = downReason.get(propId);
			if (reason === undefined) continue;
			const prop = propName.get(propId) ?? 'A prop';
			stoodDownProps.push(prop);
			stoodDownPropIds.push(propId);
			warnings.push({ kind: 'stood_down', prop, reason });
		}
		out.push({
			name: s.name,
			room: (s.roomId && roomName.get(s.roomId)) || 'No room',
			roomId: s.roomId,
			cues,
			warnings,
			stoodDownProps,
			stoodDownPropIds
		});
	}
	return out;
}

/**
 * Every assigned person's run sheet for one show, built from the database: their call, positions,
 * rooms, the scenes running in those rooms with cues and safety notes, stood-down props, their
 * checks before doors (their rooms' lines of the night's checklist), and whom to call. A safety
 * post gets every room: all scenes, a hazards summary and every safety check. Null when the show is not in the venue.
 */
export async function buildShowRunSheets(
	db: Db,
	venueId: string,
	showId: string,
	origin: string,
	what: WhatIf = {}
): Promise<ShowRunSheets | null> {
	const [row] = await db
		.select({ show: shows, venue: venues })
		.from(shows)
		.innerJoin(venues, eq(venues.id, shows.venueId))
		.where(and(eq(shows.id, showId), eq(shows.venueId, venueId)));
	if (!row) return null;
	const { show, venue } = row;
	const tz = venue.timeZone;

	const [crew, managers, scenes, specs, roomRows, openFaults] = await Promise.all([
		db
			.select({
				personId: assignments.personId,
				name: users.name,
				email: users.email,
				callOverride: assignments.callOverride,
				position: positions.name,
				safetyPost: positions.safetyPost,
				roomId: positions.roomId,
				roomName: rooms.name,
				roomOrder: rooms.position
			})
			.from(assignments)
			.innerJoin(users, eq(users.id, assignments.personId))
			// Only people who belong to the venue today get a run sheet.
			.innerJoin(
				memberships,
				and(
					eq(memberships.venueId, assignments.venueId),
					eq(memberships.personId, assignments.personId)
				)
			)
			.innerJoin(positions, eq(positions.id, assignments.positionId))
			.leftJoin(rooms, and(eq(rooms.id, positions.roomId), eq(rooms.venueId, venueId)))
			.where(and(eq(assignments.venueId, venueId), eq(assignments.showId, showId)))
			.orderBy(asc(positions.name)),
		db
			.select({ name: users.name, email: users.email })
			.from(memberships)
			.innerJoin(users, eq(users.id, memberships.personId))
			.where(and(eq(memberships.venueId, venueId), eq(memberships.role, 'show_manager')))
			.orderBy(asc(users.name)),
		sceneSheets(db, venue, showId, what),
		checklistSpecs(db, venueId, showId),
		db
			.select({ id: rooms.id, name: rooms.name, position: rooms.position })
			.from(rooms)
			.where(eq(rooms.venueId, venueId)),
		listFaults(db, venueId, { openOnly: true })
	]);
	const roomOrder = new Map(roomRows.map((r) => [r.id, r.position]));
	const roomName = new Map(roomRows.map((r) => [r.id, r.name]));
	// Checks of a stood-down prop are not worked tonight; they stay off the sheets.
	const down = new Set(scenes.flatMap((s) => s.stoodDownPropIds));
	if (what.assumeDown) down.add(what.assumeDown.propId);
	const workable = specs.filter((c) => !c.propId || !down.has(c.propId));
	/** Every room's hazards, for safety posts: rooms in venue order, scenes in name order. */
	const hazards: NonNullable<RunSheetData['hazards']> = scenes
		.filter((s) => s.warnings.length)
		.sort(
			(a, b) =>
				(a.roomId ? (roomOrder.get(a.roomId) ?? 9000) : 9999) -
				(b.roomId ? (roomOrder.get(b.roomId) ?? 9000) : 9999)
		)
		.map((s) => ({ room: s.room, scene: s.name, warnings: s.warnings }));

	const contacts: RunSheetData['safetyContacts'] = [];
	if (venue.safetyContactName || venue.safetyContactPhone)
		contacts.push({
			name: venue.safetyContactName ?? 'Safety contact',
			role: 'Safety contact',
			phone: venue.safetyContactPhone
		});
	for (const m of managers) {
		const name = m.name ?? m.email;
		// The safety contact is often a show manager: one line for the one person.
		const same = contacts.find((c) => c.name === name);
		if (same) Object.assign(same, { role: `${same.role}, show manager`, email: m.email });
		else contacts.push({ name, role: 'Show manager', email: m.email });
	}

	const byPerson = new Map<string, typeof crew>();
	for (const a of crew) byPerson.set(a.personId, [...(byPerson.get(a.personId) ?? []), a]);

	const sheets: PersonRunSheet[] = [];
	for (const [personId, mine] of byPerson) {
		const callAt = new Date(
			Math.min(...mine.map((a) => (a.callOverride ?? show.crewCall).getTime()))
		);
		const roomList = [
			...new Map(
				mine
					.filter((a) => a.roomId && a.roomName)
					.sort((a, b) => (a.roomOrder ?? 0) - (b.roomOrder ?? 0))
					.map((a) => [a.roomId!, a.roomName!])
			)
		];
		const safety = mine.some((a) => a.safetyPost);
		const roomIds = new Set(roomList.map(([id]) => id));
		// A safety post walks every room: all of tonight's scenes, hazards and safety checks.
		const theirScenes = safety ? scenes : scenes.filter((s) => s.roomId && roomIds.has(s.roomId));
		const rooms = safety
			? [
					...new Set(
						[...roomIds, ...scenes.flatMap((s) => (s.roomId ? [s.roomId] : []))].sort(
							(a, b) => (roomOrder.get(a) ?? 0) - (roomOrder.get(b) ?? 0)
						)
					)
				].map((id) => roomName.get(id) ?? 'No room')
			: roomList.map(([, n]) => n);
		const checklist = workable
			.filter((c) => (c.roomId && roomIds.has(c.roomId)) || (safety && c.kind === 'safety'))
			.map((c) => ({ room: c.roomId ? (roomName.get(c.roomId) ?? null) : null, item: c.label }));
		const faults = openFaults
			.filter((f) => safety || (f.roomId && roomIds.has(f.roomId)))
			.map((f) => ({
				room: f.roomName,
				prop: f.propName,
				severity: SEVERITY_WORDS[f.severity].toLowerCase(),
				seen: f.seen
			}));
		const name = mine[0].name ?? mine[0].email;
		const data: RunSheetData = {
			venueName: venue.name,
			address: venue.address,
			dateLabel: localDay(show.date),
			crewCall: localTime(callAt, tz, venue.clock),
			doors: `${localTime(show.doorsOpen, tz, venue.clock)}–${localTime(show.doorsClose, tz, venue.clock)}`,
			timeZone: tz,
			person: { name },
			position: [...new Set(mine.map((a) => a.position))].join(', '),
			rooms,
			...(safety ? { safetyPost: true, hazards } : {}),
			scenes: theirScenes.map(({ name, room, cues, warnings }) => ({ name, room, cues, warnings })),
			checklist,
			...(faults.length ? { faults } : {}),
			safetyContacts: contacts,
			showStop: SHOW_STOP,
			url: runSheetUrl(origin, venue.slug, show.id, personId)
		};
		sheets.push({
			personId,
			email: mine[0].email,
			name,
			callAt,
			data,
			summary: {
				show: STATUS_WORDS[show.status],
				// 24-hour words, so switching the venue's clock does not read as a change of times.
				crewCall: localTime(callAt, tz, '24h'),
				doors: `${localTime(show.doorsOpen, tz, '24h')}–${localTime(show.doorsClose, tz, '24h')}`,
				position: data.position,
				rooms: data.rooms,
				scenes: theirScenes.map((s) => s.name),
				stoodDown: [...new Set(theirScenes.flatMap((s) => s.stoodDownProps))],
				assigned: true
			},
			contentHash: hashContent(data, show.status)
		});
	}
	sheets.sort((a, b) => a.callAt.getTime() - b.callAt.getTime() || a.name.localeCompare(b.name));
	return { venue, show, sheets };
}
