import { afterAll, beforeAll, describe, expect, inject, it, vi } from 'vitest';
import { randomUUID } from 'node:crypto';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { sql } from 'drizzle-orm';
import type { RequestEvent } from '@sveltejs/kit';
import {
	assignments,
	checkResults,
	checks,
	controllers,
	outputs,
	positions,
	propFiles,
	props,
	rooms,
	scenes,
	sensors,
	type venues
} from '../../src/lib/server/db/schema';
import { ROLES, type Role } from '../../src/lib/roles';
import { createSeason, seasonShows } from '../../src/lib/server/schedule/seasons';
import { autumn } from './autumn';
import { makePerson, makeVenue, testDb } from './db';
import { answerOf, asSession, eventFor, useTestEnv, type Answer } from './routes';
import { PNG_1x1, testStore } from './uploads';

// Who may reach what: every page load, layout load, form action and API handler in the route
// tree, called once as each venue role, as a member of another venue and signed out, against a
// stocked venue with real ids in the address. What each should answer is written once per route in
// MATRIX below; a route, action or method in the tree without an entry fails, and so does an entry
// for something no longer there.
//
// Each route's own code is called directly (the venue hook fills locals first), so each one must
// guard itself: SvelteKit may skip a layout's load on a data request, and form actions run without
// any load. The app-wide guard hook is then asked the same question and may only refuse what the
// route would refuse, the same way.
//
// What counts as an answer:
// - allowed: anything but 401, 403, 404 and a redirect to sign-in. The ids in the address are real
//   and the forms are empty, so an allowed caller gets the page, a 400 for the empty form, or a
//   redirect elsewhere; a 404 would mean the route hid the row from someone it should serve. A form
//   action may answer 404 for the row its empty form does not name, never with the venue's 404.
// - refused, signed out: a 303 to /sign-in coming back here for pages and form actions, 401 for /api.
// - refused, member of another venue: the venue's 404 on venue routes (no venue name leaks).
// - refused, any other: 403.
vi.mock('$env/dynamic/private', () => ({ env: process.env }));
useTestEnv();
// Signing out goes through Auth.js, which needs its secret and the site's address.
process.env.ORIGIN ??= 'http://127.0.0.1:5510';
process.env.AUTH_SECRET ??= 'test-secret-for-the-role-matrix-0123456789';
const db = testDb();

/**
 * The members of the stocked venue: one of each role, and two crew, one assigned to the stocked
 * show ('crew') and one not ('crewOff'), since crew see only the shows they work.
 */
type Seat = Role | 'crewOff';
const SEATS: Seat[] = [...ROLES, 'crewOff'];

/** The role sets the product defines (design.md, "Users and roles"); guard.ts must agree. */
const SETS = {
	member: SEATS,
	/** Props, controllers, sensors, outputs, scenes, rooms. */
	editors: ['owner', 'designer'],
	/** Seasons, shows, positions, assignments, safety items, run sheets, mail. */
	planners: ['owner', 'show_manager'],
	owner: ['owner'],
	/** A show's checklist and run sheets: planners, and whoever is assigned to the show. */
	assigned: ['owner', 'show_manager', 'crew'],
	/** A show's page: every role, but crew only on a show they are assigned to. */
	crewIfAssigned: ['owner', 'designer', 'show_manager', 'crew'],
	/**
	 * Everyone but crew: the season and position pages and the venue's calendar feed (crew see
	 * their own nights, positions and feed under My nights).
	 */
	notCrew: ['owner', 'designer', 'show_manager']
} satisfies Record<string, Seat[]>;

/**
 * public: no guard (the token in the address, if any, is the permission); person: anyone signed
 * in; invitee: only the person the invitation is for (nobody here); board: only a board key in the
 * Authorization header (no person, signed in or not, gets past: 401); or one of the role sets.
 */
type Rule = 'public' | 'person' | 'invitee' | 'board' | keyof typeof SETS;
const METHODS = ['GET', 'HEAD', 'POST', 'PUT', 'PATCH', 'DELETE', 'OPTIONS', 'fallback'] as const;
type Method = (typeof METHODS)[number];
type Entry = { layout?: Rule; load?: Rule; actions?: Record<string, Rule> } & {
	[M in Method]?: Rule;
};

/** Keyed by SvelteKit route id (folder path with its groups), as event.route.id gives it. */
const MATRIX: Record<string, Entry> = {
	'/': { layout: 'public', load: 'person' },
	'/(auth)/sign-in': { load: 'public', actions: { password: 'public', link: 'public' } },
	'/(auth)/sign-out': { load: 'public', actions: { default: 'public' } },
	'/(auth)/invitations/[token]': {
		load: 'public',
		actions: { join: 'invitee', create: 'public' }
	},
	'/calendar/[token].ics': { GET: 'public' },
	'/theme': { POST: 'public' },
	'/health': { GET: 'public' },
	'/(app)': { layout: 'person' },
	'/(app)/venues': { load: 'person', actions: { create: 'person' } },
	'/api/offline': { GET: 'person' },
	'/api/boards/readings': { POST: 'board' },

	'/(app)/v/[venue]': { layout: 'member', load: 'member' },
	'/(app)/v/[venue]/activity': { load: 'owner' },
	'/(app)/v/[venue]/settings': { load: 'owner', actions: { save: 'owner' } },
	'/(app)/v/[venue]/members': {
		load: 'owner',
		actions: { invite: 'owner', role: 'owner', remove: 'owner', revoke: 'owner' }
	},
	'/(app)/v/[venue]/mail': { load: 'planners', actions: { resend: 'planners' } },
	'/(app)/v/[venue]/mail/preview': { load: 'owner' },
	'/(app)/v/[venue]/calendar': {
		load: 'member',
		actions: { addShow: 'planners', feed: 'notCrew' }
	},
	'/(app)/v/[venue]/my-nights': {
		load: 'member',
		actions: { away: 'member', available: 'member', feed: 'member' }
	},
	'/(app)/v/[venue]/controllers': {
		load: 'member',
		actions: {
			add: 'editors',
			save: 'editors',
			remove: 'editors',
			issueKey: 'editors',
			revokeKey: 'editors'
		}
	},
	'/(app)/v/[venue]/controllers/[controller=uuid]/firmware.h': { GET: 'editors' },
	'/(app)/v/[venue]/rooms': {
		load: 'member',
		actions: { add: 'editors', rename: 'editors', remove: 'editors' }
	},
	'/(app)/v/[venue]/positions': {
		load: 'notCrew',
		actions: { add: 'planners', edit: 'planners', remove: 'planners' }
	},
	'/(app)/v/[venue]/safety': {
		load: 'planners',
		actions: { add: 'planners', retire: 'planners', restore: 'planners', move: 'planners' }
	},
	'/(app)/v/[venue]/props': { load: 'member' },
	'/(app)/v/[venue]/props/new': { load: 'editors', actions: { default: 'editors' } },
	'/(app)/v/[venue]/props/[prop=uuid]': {
		load: 'member',
		actions: {
			save: 'editors',
			addSensor: 'editors',
			addOutput: 'editors',
			removeSensor: 'editors',
			removeOutput: 'editors',
			removeFile: 'editors',
			remove: 'editors'
		}
	},
	'/(app)/v/[venue]/props/[prop=uuid]/faults': {
		load: 'member',
		actions: { report: 'member', repair: 'editors', retest: 'member', close: 'notCrew' }
	},
	'/(app)/v/[venue]/props/[prop=uuid]/files/[file=uuid]': { GET: 'member' },
	'/(app)/v/[venue]/props/[prop=uuid]/outputs/[output=uuid]': {
		load: 'member',
		actions: { save: 'editors', curve: 'editors', wear: 'editors', maintained: 'editors' }
	},
	'/(app)/v/[venue]/props/[prop=uuid]/outputs/[output=uuid]/level-table.csv': { GET: 'member' },
	'/(app)/v/[venue]/props/[prop=uuid]/outputs/[output=uuid]/level-table.h': { GET: 'member' },
	'/(app)/v/[venue]/props/[prop=uuid]/outputs/[output=uuid]/level-table.json': { GET: 'member' },
	'/(app)/v/[venue]/props/[prop=uuid]/sensors/[sensor=uuid]': {
		load: 'member',
		actions: { save: 'editors', apply: 'editors', removeCapture: 'editors' }
	},
	'/(app)/v/[venue]/scenes': {
		load: 'member',
		actions: { duplicate: 'editors', brighten: 'editors' }
	},
	'/(app)/v/[venue]/scenes/new': { load: 'editors', actions: { default: 'editors' } },
	'/(app)/v/[venue]/scenes/[scene=uuid]': {
		load: 'member',
		actions: { save: 'editors', duplicate: 'editors', remove: 'editors' }
	},
	'/(app)/v/[venue]/seasons': { load: 'notCrew' },
	'/(app)/v/[venue]/seasons/new': {
		load: 'planners',
		actions: { preview: 'planners', save: 'planners' }
	},
	'/(app)/v/[venue]/seasons/[season=uuid]': {
		load: 'notCrew',
		actions: { preview: 'planners', save: 'planners', remove: 'planners' }
	},
	'/(app)/v/[venue]/seasons/[season=uuid]/incidents.csv': { GET: 'planners' },
	'/(app)/v/[venue]/seasons/[season=uuid]/report': { load: 'notCrew' },
	'/(app)/v/[venue]/shows/[show=uuid]': {
		load: 'crewIfAssigned',
		actions: {
			times: 'planners',
			status: 'planners',
			assign: 'planners',
			reassign: 'planners',
			unassign: 'planners',
			exclude: 'planners',
			include: 'planners',
			restore: 'planners',
			signOff: 'planners',
			guests: 'planners'
		}
	},
	'/(app)/v/[venue]/shows/[show=uuid]/close': {
		load: 'assigned',
		actions: { tick: 'assigned', sign: 'planners' }
	},
	'/(app)/v/[venue]/shows/[show=uuid]/stand-down': {
		load: 'planners',
		actions: { default: 'planners' }
	},
	'/(app)/v/[venue]/shows/[show=uuid]/checklist': { load: 'assigned' },
	// Anyone on the night reports; a follow-up note from crew with an empty form is a 400 (who may
	// write one is the incident's question, asked once it is named); closing is for planners.
	'/(app)/v/[venue]/shows/[show=uuid]/incidents': {
		load: 'assigned',
		actions: { report: 'assigned', followUp: 'assigned', close: 'planners' }
	},
	'/(app)/v/[venue]/shows/[show=uuid]/checklist/print': { load: 'assigned' },
	'/(app)/v/[venue]/shows/[show=uuid]/checklist/photos/[result=uuid]': { GET: 'assigned' },
	'/(app)/v/[venue]/shows/[show=uuid]/run-sheets': {
		load: 'assigned',
		actions: { send: 'planners', retry: 'planners' }
	},
	'/(app)/v/[venue]/shows/[show=uuid]/run-sheets/[person=uuid]': { load: 'assigned' },

	'/api/v/[venue]/calculators/[name]': { POST: 'member' },
	'/api/v/[venue]/calendar': { GET: 'member', POST: 'planners' },
	'/api/v/[venue]': { GET: 'member' },
	'/api/v/[venue]/rooms': { GET: 'member' },
	'/api/v/[venue]/props': { GET: 'member', POST: 'editors' },
	'/api/v/[venue]/props/[prop=uuid]': { GET: 'member', PUT: 'editors' },
	'/api/v/[venue]/props/[prop=uuid]/files': { GET: 'member', POST: 'editors' },
	'/api/v/[venue]/props/[prop=uuid]/outputs': { POST: 'editors' },
	'/api/v/[venue]/props/[prop=uuid]/sensors': { POST: 'editors' },
	'/api/v/[venue]/props/[prop=uuid]/sensors/[sensor=uuid]/live': { GET: 'notCrew' },
	'/api/v/[venue]/props/[prop=uuid]/sensors/[sensor=uuid]/captures': {
		GET: 'member',
		POST: 'editors'
	},
	'/api/v/[venue]/scenes': { GET: 'member', POST: 'editors' },
	'/api/v/[venue]/scenes/[scene=uuid]': { GET: 'member', PUT: 'editors', DELETE: 'editors' },
	'/api/v/[venue]/scenes/[scene=uuid]/analysis': { GET: 'member' },
	'/api/v/[venue]/scenes/[scene=uuid]/cues': { GET: 'member', POST: 'editors' },
	'/api/v/[venue]/shows/[show=uuid]/checks': { GET: 'assigned' },
	'/api/v/[venue]/shows/[show=uuid]/board': { GET: 'assigned' },
	'/api/v/[venue]/shows/[show=uuid]/live': { GET: 'assigned' },
	'/api/v/[venue]/shows/[show=uuid]/photos': { POST: 'assigned' },
	'/api/v/[venue]/shows/[show=uuid]/results': { POST: 'assigned' },
	'/api/v/[venue]/shows/[show=uuid]/run-sheets': { GET: 'planners' }
};

/**
 * Calls that remove the row named in their address: each allowed caller gets its own copy of
 * that row, so the next caller still finds the stocked one.
 */
const REMOVES_ITS_ROW: Record<string, string> = {
	'action /(app)/v/[venue]/props/[prop=uuid]?/remove': 'prop',
	'action /(app)/v/[venue]/scenes/[scene=uuid]?/remove': 'scene',
	'action /(app)/v/[venue]/seasons/[season=uuid]?/remove': 'season',
	'DELETE /api/v/[venue]/scenes/[scene=uuid]': 'scene'
};

type Run = (event: RequestEvent) => unknown;
type Kind = 'layout' | 'load' | 'action' | Method;
interface Target {
	label: string;
	routeId: string;
	kind: Kind;
	name: string;
	run: Run;
}

// Every server module of the route tree, found by Vite.
const modules = {
	...import.meta.glob('../../src/routes/**/+server.ts'),
	...import.meta.glob('../../src/routes/**/+page.server.ts'),
	...import.meta.glob('../../src/routes/**/+layout.server.ts')
};
const targets: Target[] = [];
for (const [file, load] of Object.entries(modules)) {
	const routeId =
		file.replace('../../src/routes', '').replace(/\/\+(page\.|layout\.)?server\.ts$/, '') || '/';
	const mod = (await load()) as Record<string, unknown>;
	const add = (kind: Kind, name: string, run: unknown, label: string) =>
		targets.push({ label, routeId, kind, name, run: run as Run });
	if (file.endsWith('+layout.server.ts')) {
		if (typeof mod.load === 'function') add('layout', 'layout', mod.load, `layout ${routeId}`);
		continue;
	}
	if (typeof mod.load === 'function') add('load', 'load', mod.load, `load ${routeId}`);
	for (const m of METHODS) if (typeof mod[m] === 'function') add(m, m, mod[m], `${m} ${routeId}`);
	for (const [name, run] of Object.entries((mod.actions ?? {}) as Record<string, unknown>))
		add('action', name, run, `action ${routeId}?/${name}`);
}

function ruleOf(t: Target): Rule | undefined {
	const entry = MATRIX[t.routeId];
	if (!entry) return undefined;
	if (t.kind === 'action')
		return Object.hasOwn(entry.actions ?? {}, t.name) ? entry.actions![t.name] : undefined;
	return entry[t.kind];
}

type Actor = Seat | 'outsider' | 'signedOut';
const ACTORS: Actor[] = [...SEATS, 'outsider', 'signedOut'];

function allows(rule: Rule, actor: Actor) {
	if (rule === 'public') return true;
	if (rule === 'board' || actor === 'signedOut') return false;
	if (rule === 'person') return true;
	if (rule === 'invitee' || actor === 'outsider') return false;
	return (SETS[rule] as Seat[]).includes(actor);
}

const VENUE_404 = 'There is no such venue, or you are not a member of it.';

interface Stock {
	venue: typeof venues.$inferSelect;
	ids: Record<string, string>;
}
let here: Stock;
const people: Record<string, { id: string; name: string | null; email: string }> = {};

async function stock(): Promise<Stock> {
	const names = ['Odile Fenwick', 'Piet Varga', 'Wren Holloway', 'Ivo Brackenridge', 'Tamsin Reed'];
	const [owner, designer, showManager, crew, crewOff, outsider] = await Promise.all(
		[...names, 'Ansel Marsh'].map((n) => makePerson(db, n))
	);
	Object.assign(people, { owner, designer, show_manager: showManager, crew, crewOff, outsider });
	const { venue } = await makeVenue(db, [
		[owner.id, 'owner'],
		[designer.id, 'designer'],
		[showManager.id, 'show_manager'],
		[crew.id, 'crew'],
		[crewOff.id, 'crew']
	]);
	// The outsider owns a venue of their own: a member elsewhere, not here.
	await makeVenue(db, [[outsider.id, 'owner']]);
	const v = venue.id;
	const [room] = await db.insert(rooms).values({ venueId: v, name: 'Crypt' }).returning();
	const [controller] = await db
		.insert(controllers)
		.values({
			venueId: v,
			name: 'Crypt board',
			supplyV: 5,
			clockHz: 16e6,
			timerBits: 16,
			pwmBits: 8,
			referenceV: 1.1,
			pinLimitMa: 20,
			supplyRatingA: 2
		})
		.returning();
	const [prop] = await db
		.insert(props)
		.values({ venueId: v, name: 'Lid', roomId: room.id, controllerId: controller.id })
		.returning();
	const [sensor] = await db
		.insert(sensors)
		.values({
			venueId: v,
			propId: prop.id,
			name: 'Lid button',
			kind: 'button',
			settings: { kind: 'button' } as never
		})
		.returning();
	const [output] = await db
		.insert(outputs)
		.values({
			venueId: v,
			propId: prop.id,
			kind: 'led_string',
			name: 'Glow',
			settings: {
				kind: 'led_string',
				colour: 'white',
				forwardV: 3.2,
				ledsInSeries: 3,
				strings: 1,
				currentMa: 20,
				supplyV: 12,
				switchDropV: 0.1,
				logicHighV: 5,
				gateThresholdMaxV: 2.5,
				continuousDrainMa: 200
			},
			curve: { kind: 'cie' },
			safeState: 'off'
		})
		.returning();
	const [scene] = await db
		.insert(scenes)
		.values({ venueId: v, name: 'Lid lifts', roomId: room.id, lengthMs: 4000 })
		.returning();
	const [post] = await db.insert(positions).values({ venueId: v, name: 'Queue line' }).returning();
	const { season } = await createSeason(db, v, venue.timeZone, autumn);
	const [show] = await seasonShows(db, v, season.id);
	// One crew member is assigned to the show; the designer and the other crew member are not.
	await db
		.insert(assignments)
		.values({ venueId: v, showId: show.id, positionId: post.id, personId: crew.id });

	// A stored photo of the prop and of a check on the show, so the file routes find them.
	const dir = mkdtempSync(join(tmpdir(), 'role-matrix-'));
	writeFileSync(join(dir, 'p.png'), PNG_1x1);
	const store = testStore();
	const fileKey = `venues/${v}/props/${prop.id}/${randomUUID()}.png`;
	const { photoPrefix } = await import('../../src/lib/server/checklists/record');
	const photoKey = `${photoPrefix(v, show.id)}${randomUUID()}.png`;
	await store.putFile(fileKey, join(dir, 'p.png'), 'image/png');
	await store.putFile(photoKey, join(dir, 'p.png'), 'image/png');
	const [file] = await db
		.insert(propFiles)
		.values({
			venueId: v,
			propId: prop.id,
			kind: 'photo',
			objectKey: fileKey,
			filename: 'lid.png',
			contentType: 'image/png',
			sizeBytes: PNG_1x1.length,
			sha256: '0'.repeat(64)
		})
		.returning();
	const [check] = await db
		.insert(checks)
		.values({
			venueId: v,
			showId: show.id,
			key: 'venue:gate',
			kind: 'safety',
			label: 'Gate',
			expected: { mode: 'pass_fail' },
			sortKey: '1'
		})
		.returning();
	const [result] = await db
		.insert(checkResults)
		.values({
			venueId: v,
			showId: show.id,
			checkId: check.id,
			outcome: 'pass',
			photoKey,
			clientId: randomUUID()
		})
		.returning();

	const { createInvitation } = await import('../../src/lib/server/venues/members');
	const { resetFeed } = await import('../../src/lib/server/schedule/feeds');
	const invitation = await createInvitation(db, v, 'newcomer@gloaming.test', 'crew', owner.id);
	const feed = await resetFeed(db, crew.id, 'person');
	return {
		venue,
		ids: {
			room: room.id,
			prop: prop.id,
			controller: controller.id,
			sensor: sensor.id,
			output: output.id,
			scene: scene.id,
			position: post.id,
			season: season.id,
			show: show.id,
			file: file.id,
			result: result.id,
			person: crew.id,
			name: 'capacitive',
			invitation: invitation.token,
			feed
		}
	};
}

let spareSeasons = 0;
/** A fresh copy of a row for a call that removes the row in its address. */
async function spare(kind: string): Promise<string> {
	const v = here.venue.id;
	if (kind === 'prop')
		return (
			await db
				.insert(props)
				.values({ venueId: v, name: `Spare ${randomUUID()}` })
				.returning()
		)[0].id;
	if (kind === 'scene')
		return (
			await db
				.insert(scenes)
				.values({ venueId: v, name: `Spare ${randomUUID()}`, lengthMs: 1000 })
				.returning()
		)[0].id;
	if (kind === 'season') {
		const year = 2030 + spareSeasons++;
		const { season } = await createSeason(db, v, here.venue.timeZone, {
			...autumn,
			name: `Spare ${year}`,
			firstNight: `${year}-10-04`,
			openingNight: `${year}-10-04`,
			rule: `FREQ=WEEKLY;BYDAY=FR;UNTIL=${year}1011`,
			darkNights: []
		});
		return season.id;
	}
	throw new Error(`No spare ${kind} rows: teach spare() to make one.`);
}

/** The stocked rows that are gone, so a call that removed one is named at once. */
async function missingRows() {
	const { ids } = here;
	const tables: [string, string][] = [
		['rooms', ids.room],
		['props', ids.prop],
		['sensors', ids.sensor],
		['outputs', ids.output],
		['scenes', ids.scene],
		['positions', ids.position],
		['seasons', ids.season],
		['shows', ids.show],
		['prop_files', ids.file],
		['check_results', ids.result]
	];
	const parts = tables.map(
		([t, id]) =>
			sql`(select count(*) from ${sql.identifier(t)} where id = ${id})::int as ${sql.identifier(t)}`
	);
	const [row] = (await db.execute(
		sql`select ${sql.join(parts, sql`, `)}, (select count(*) from memberships where venue_id = ${here.venue.id})::int as memberships`
	)) as unknown as Record<string, number>[];
	return Object.entries(row)
		.filter(([t, n]) => (t === 'memberships' ? n !== SEATS.length : n !== 1))
		.map(([t]) => t);
}

function paramsOf(routeId: string): string[] {
	return [...routeId.matchAll(/\[(\w+)(?:=\w+)?\]/g)].map((m) => m[1]);
}

async function paramsFor(t: Target, actor: Actor) {
	const out: Record<string, string> = {};
	for (const p of paramsOf(t.routeId)) {
		if (p === 'venue') out.venue = here.venue.slug;
		else if (p === 'token')
			out.token = t.routeId.startsWith('/calendar/') ? here.ids.feed : here.ids.invitation;
		else if (here.ids[p]) out[p] = here.ids[p];
		else throw new Error(`${t.label}: the stock has no ${p} to put in the address; add one.`);
	}
	const removes = REMOVES_ITS_ROW[t.label];
	if (removes && allows(ruleOf(t)!, actor)) out[removes] = await spare(removes);
	return out;
}

const pathOf = (routeId: string, params: Record<string, string>) =>
	routeId.replace(/\/\([^)]+\)/g, '').replace(/\[(\w+)(?:=\w+)?\]/g, (_, p: string) => params[p]) ||
	'/';

const isApi = (t: Target) => t.routeId.startsWith('/api/');
const isVenueRoute = (t: Target) => paramsOf(t.routeId).includes('venue');
const signInFor = (path: string) => `/sign-in?redirectTo=${encodeURIComponent(path)}`;

/** What the table says a refused caller gets from the route's own code. */
function refusal(t: Target, actor: Actor, path: string): Partial<Answer> {
	if (ruleOf(t) === 'board') return { status: 401 };
	// path is the address with its query (?/name for an action): sign-in sends the person back there.
	if (actor === 'signedOut')
		return isApi(t) ? { status: 401 } : { status: 303, location: signInFor(path) };
	if (actor === 'outsider' && isVenueRoute(t)) return { status: 404, body: { message: VENUE_404 } };
	return { status: 403 };
}

/**
 * Past the guard: not 401 or 403, no redirect to sign-in, and no 404, except from a form action
 * whose empty form names no row (never the venue's own 404).
 */
const passedGuard = (t: Target, a: Answer) =>
	![401, 403].includes(a.status) &&
	!(a.location ?? '').startsWith('/sign-in') &&
	(a.status !== 404 || (t.kind === 'action' && a.body?.message !== VENUE_404));

const brief = (a: Answer | string) =>
	typeof a === 'string'
		? a
		: `${a.status}${a.location ? ` → ${a.location}` : ''} ${JSON.stringify(a.body)?.slice(0, 160) ?? ''}`;

/** The app-wide guard hook's verdict on the same request: passed, or how it refused. */
async function hookVerdict(event: RequestEvent): Promise<'passed' | Answer> {
	const { guardHandle } = await import('../../src/lib/server/hooks/guard');
	let passed = false;
	const answer = await answerOf(() =>
		guardHandle({
			event,
			resolve: async () => {
				passed = true;
				return new Response(null, { status: 204 });
			}
		} as never)
	);
	return passed ? 'passed' : answer;
}

/** The hook refuses as the route would, except that it answers a signed-out action with 401. */
function hookRefusal(t: Target, actor: Actor, path: string): Partial<Answer> {
	if (actor === 'signedOut' && t.kind === 'action') return { status: 401 };
	return refusal(t, actor, path);
}

async function call(t: Target, actor: Actor) {
	const params = await paramsFor(t, actor);
	const path = pathOf(t.routeId, params);
	const method =
		t.kind === 'action' ? 'POST' : t.kind === 'layout' || t.kind === 'load' ? 'GET' : t.kind;
	const person = actor === 'signedOut' ? null : asSession(people[actor]);
	const search = t.kind === 'action' ? `?/${t.name}` : '';
	const hasBody = !['GET', 'HEAD', 'OPTIONS'].includes(method);
	const event = await eventFor({
		path: path + search,
		params,
		person,
		method,
		routeId: t.routeId,
		...(t.kind === 'action' ? { body: new FormData() } : hasBody ? { json: {} } : {})
	});
	Object.assign(event, {
		parent: async () => ({}),
		depends() {},
		untrack: <T>(fn: () => T) => fn()
	});
	const hook = await hookVerdict(event);
	const answer = await answerOf(() => t.run(event));
	return { path: path + search, answer, hook };
}

beforeAll(async () => {
	const { startMailQueue } = await import('../../src/lib/server/mail/queue');
	await startMailQueue({
		connectionString: inject('databaseUrl'),
		db,
		send: async () => {},
		pollingIntervalSeconds: 5
	});
	here = await stock();
});

afterAll(async () => {
	const { stopMailQueue } = await import('../../src/lib/server/mail/queue');
	await stopMailQueue();
});

describe('the role-by-route matrix', () => {
	it('names the same role sets as the server', async () => {
		const { EDITORS, PLANNERS } = await import('../../src/lib/server/auth/guard');
		expect([...EDITORS].sort()).toEqual([...SETS.editors].sort());
		expect([...PLANNERS].sort()).toEqual([...SETS.planners].sort());
	});

	it('has an entry for everything in the route tree, and nothing else', () => {
		expect(targets.length).toBeGreaterThan(100);
		const unlisted = targets.filter((t) => ruleOf(t) === undefined).map((t) => t.label);
		expect(unlisted, 'Found in the route tree with no entry in MATRIX: add them').toEqual([]);
		const found = new Set(targets.map((t) => t.label));
		const stale: string[] = [];
		for (const [routeId, entry] of Object.entries(MATRIX)) {
			for (const kind of ['layout', 'load', ...METHODS] as const)
				if (entry[kind] && !found.has(`${kind} ${routeId}`)) stale.push(`${kind} ${routeId}`);
			for (const name of Object.keys(entry.actions ?? {}))
				if (!found.has(`action ${routeId}?/${name}`)) stale.push(`action ${routeId}?/${name}`);
		}
		expect(stale, 'In MATRIX but not in the route tree: remove them').toEqual([]);
		for (const label of Object.keys(REMOVES_ITS_ROW))
			expect(found.has(label), `REMOVES_ITS_ROW names ${label}, which is gone`).toBe(true);
	});

	it('lets in exactly the roles each entry names, and refuses the rest as it says', async () => {
		const problems: string[] = [];
		let pairs = 0;
		// A route that fails unexpectedly logs before it answers 500; the answer is what is checked.
		vi.spyOn(console, 'error').mockImplementation(() => {});
		for (const t of targets) {
			const rule = ruleOf(t);
			if (!rule) continue;
			const refused = ACTORS.filter((a) => !allows(rule, a));
			const allowed = ACTORS.filter((a) => allows(rule, a));
			pairs += refused.length + allowed.length;
			// Refused callers first, together: each must be stopped before it touches a row.
			for (const found of await Promise.all(refused.map((a) => check(t, rule, a))))
				problems.push(...found);
			for (const a of allowed) problems.push(...(await check(t, rule, a)));
			const gone = await missingRows();
			if (gone.length) {
				problems.push(
					`${t.label} removed stocked rows (${gone.join(', ')}): list it in REMOVES_ITS_ROW`
				);
				break;
			}
		}
		vi.restoreAllMocks();
		expect(problems).toEqual([]);
		expect(pairs).toBe(targets.length * ACTORS.length);
		console.log(
			`role matrix: ${new Set(targets.map((t) => t.routeId)).size} routes, ` +
				`${targets.filter((t) => t.kind === 'load' || t.kind === 'layout').length} loads, ` +
				`${targets.filter((t) => t.kind === 'action').length} actions, ` +
				`${targets.filter((t) => METHODS.includes(t.kind as Method)).length} handlers, ${pairs} pairs`
		);
	}, 60_000);
});

/** One request, and what is wrong with its answer and the hook's. */
async function check(t: Target, rule: Rule, actor: Actor): Promise<string[]> {
	const who = `${t.label} as ${actor} (${rule})`;
	const made = await call(t, actor).catch((e: Error) => e);
	if (made instanceof Error) return [`${who} threw: ${made.message}`];
	const { path, answer, hook } = made;
	if (answer.status >= 500) return [`${who}: ${brief(answer)}`];
	const problems: string[] = [];
	if (allows(rule, actor)) {
		if (!passedGuard(t, answer))
			problems.push(`${who} should get past the guard: ${brief(answer)}`);
		if (hook !== 'passed') problems.push(`${who}: the guard hook refused: ${brief(hook)}`);
	} else {
		const want = refusal(t, actor, path);
		if (!matches(answer, want))
			problems.push(`${who} should be refused with ${brief(want as Answer)}: ${brief(answer)}`);
		const hookWant = hookRefusal(t, actor, path);
		if (hook !== 'passed' && !matches(hook, hookWant))
			problems.push(
				`${who}: the guard hook refused with ${brief(hook)}, not ${brief(hookWant as Answer)}`
			);
	}
	return problems;
}

function matches(answer: Answer, want: Partial<Answer>) {
	if (answer.status !== want.status) return false;
	// Back to the page itself is as good as back to the page with its ?/action.
	const back = (want.location ?? '').replace(/%3F%2F\w+$/, '');
	if (want.location !== undefined && answer.location !== want.location && answer.location !== back)
		return false;
	if (want.body?.message !== undefined && answer.body?.message !== want.body.message) return false;
	return true;
}
