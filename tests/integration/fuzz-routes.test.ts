import { afterAll, beforeAll, describe, expect, inject, it, vi } from 'vitest';
import { randomUUID } from 'node:crypto';
import fc from 'fast-check';
import { sql } from 'drizzle-orm';
import {
	outputs,
	positions,
	props,
	rooms,
	scenes,
	sensors,
	type venues
} from '../../src/lib/server/db/schema';
import { createSeason, seasonShows } from '../../src/lib/server/schedule/seasons';
import { autumn } from './autumn';
import { makePerson, makeVenue, testDb } from './db';
import { asSession, callAction, callHandler, useTestEnv, type Answer } from './routes';

// Generated hostile requests (ids of this venue, another venue and none; odd field names; text
// PostgreSQL cannot store; bodies that are not what they claim) sent to every API route and every
// venue form action, signed in as each role, signed out, and as a member of another venue. None
// may answer 5xx or throw, and none may change another venue's rows.
// FUZZ_RUNS sets the number of requests (npm test keeps it small; FUZZ_RUNS=2000 for a long run).
vi.mock('$env/dynamic/private', () => ({ env: process.env }));
useTestEnv();
const db = testDb();
const RUNS = Number(process.env.FUZZ_RUNS ?? 264);
const SEED = process.env.FUZZ_SEED ? Number(process.env.FUZZ_SEED) : undefined;

type Handler = (event: never) => unknown;
interface Target {
	label: string;
	/** The route's path pattern, e.g. /api/v/[venue]/props/[prop=uuid]. */
	route: string;
	params: string[];
	method: string;
	run: Handler;
	action: boolean;
}

// Every route module, found by Vite; the live stream never ends and has its own tests.
const modules = {
	...import.meta.glob('../../src/routes/**/+server.ts'),
	...import.meta.glob('../../src/routes/**/+page.server.ts')
};
const targets: Target[] = [];
for (const [file, load] of Object.entries(modules)) {
	const route = file
		.replace('../../src/routes', '')
		.replace(/\/\+(page\.)?server\.ts$/, '')
		.replace(/\/\([^)]+\)/g, '');
	if (!route.startsWith('/api/v/') && !route.startsWith('/v/') && !route.startsWith('/api/boards/'))
		continue;
	if (route.endsWith('/live')) continue;
	const params = [...route.matchAll(/\[(\w+)(?:=\w+)?\]/g)].map((m) => m[1]);
	const mod = (await load()) as Record<string, unknown>;
	for (const method of ['GET', 'POST', 'PUT', 'PATCH', 'DELETE'])
		if (typeof mod[method] === 'function')
			targets.push({
				label: `${method} ${route}`,
				route,
				params,
				method,
				run: mod[method] as Handler,
				action: false
			});
	const actions = (mod.actions ?? {}) as Record<string, Handler>;
	for (const [name, run] of Object.entries(actions))
		targets.push({
			label: `action ${route}?/${name}`,
			route,
			params,
			method: 'POST',
			run,
			action: true
		});
}

interface Place {
	venue: typeof venues.$inferSelect;
	ids: Record<string, string[]>;
}
let here: Place;
let there: Place;
const actors: Record<string, ReturnType<typeof asSession> | null> = {};
let venueTables: string[] = [];

async function stock(venue: Place['venue']): Promise<Place> {
	const [room] = await db.insert(rooms).values({ venueId: venue.id, name: 'Crypt' }).returning();
	const [prop] = await db
		.insert(props)
		.values({ venueId: venue.id, name: 'Lid', roomId: room.id })
		.returning();
	const [sensor] = await db
		.insert(sensors)
		.values({
			venueId: venue.id,
			propId: prop.id,
			name: 'Lid button',
			kind: 'button',
			settings: { kind: 'button' } as never
		})
		.returning();
	const [output] = await db
		.insert(outputs)
		.values({
			venueId: venue.id,
			propId: prop.id,
			kind: 'relay',
			relayKind: 'fog',
			name: 'Fog',
			settings: {} as never,
			safeState: 'off'
		})
		.returning();
	const [scene] = await db
		.insert(scenes)
		.values({ venueId: venue.id, name: 'Lid lifts', roomId: room.id, lengthMs: 4000 })
		.returning();
	const [post] = await db
		.insert(positions)
		.values({ venueId: venue.id, name: 'Queue line' })
		.returning();
	const { season } = await createSeason(db, venue.id, venue.timeZone, autumn);
	const nights = await seasonShows(db, venue.id, season.id);
	return {
		venue,
		ids: {
			room: [room.id],
			prop: [prop.id],
			sensor: [sensor.id],
			output: [output.id],
			scene: [scene.id],
			position: [post.id],
			season: [season.id],
			show: nights.slice(0, 2).map((n) => n.id)
		}
	};
}

/**
 * What of a row the fingerprint reads: all of it, except where a background worker changes it
 * later (the mail worker marks a message sent), which would be blamed on a later request.
 */
const ROW_TEXT: Record<string, string> = {
	mail_messages: '(x.id, x.kind, x.subject_id, x.recipient, x.subject, x.html, x.text)::text'
};

/** A fingerprint of every row each venue owns, both in one round trip. */
async function fingerprints() {
	const of = (venueId: string) => {
		const parts = venueTables.map(
			(t) =>
				`coalesce((select md5(string_agg(${ROW_TEXT[t] ?? 'x::text'}, '|' order by ${ROW_TEXT[t] ?? 'x::text'})) from "${t}" x where x.venue_id = '${venueId}'), '-')`
		);
		parts.push(`coalesce((select md5(v::text) from venues v where v.id = '${venueId}'), '-')`);
		// Table by table, so a failure can say which of the venue's tables changed.
		const names = [...venueTables, 'venues'];
		return `concat_ws(' ', ${parts.map((p, i) => `'${names[i]}=' || left(${p}, 8)`).join(', ')})`;
	};
	const rows = await db.execute(
		sql.raw(`select ${of(here.venue.id)} as here, ${of(there.venue.id)} as there`)
	);
	return (rows as unknown as { here: string; there: string }[])[0];
}

beforeAll(async () => {
	const { startMailQueue } = await import('../../src/lib/server/mail/queue');
	await startMailQueue({
		connectionString: inject('databaseUrl'),
		db,
		send: async () => {},
		pollingIntervalSeconds: 5
	});
	const people = {
		owner: await makePerson(db, 'Odile Fenwick'),
		designer: await makePerson(db, 'Piet Varga'),
		show_manager: await makePerson(db, 'Wren Holloway'),
		crew: await makePerson(db, 'Ivo Brackenridge'),
		outsider: await makePerson(db, 'Ansel Marsh')
	};
	const { venue: a } = await makeVenue(db, [
		[people.owner.id, 'owner'],
		[people.designer.id, 'designer'],
		[people.show_manager.id, 'show_manager'],
		[people.crew.id, 'crew']
	]);
	const { venue: b } = await makeVenue(db, [[people.outsider.id, 'owner']]);
	here = await stock(a);
	there = await stock(b);
	for (const [role, p] of Object.entries(people)) actors[role] = asSession(p);
	actors.signedOut = null;
	const cols = await db.execute(
		sql`select table_name from information_schema.columns where table_schema = 'public' and column_name = 'venue_id' order by table_name`
	);
	venueTables = (cols as unknown as { table_name: string }[]).map((r) => r.table_name);
});

afterAll(async () => {
	const { stopMailQueue } = await import('../../src/lib/server/mail/queue');
	await stopMailQueue();
});

// Field names people type and names nobody should: dotted paths, prototype keys, a NUL.
const FIELD_NAMES = [
	'id',
	'name',
	'notes',
	'kind',
	'email',
	'role',
	'date',
	'reason',
	'label',
	'status',
	'call',
	'detach',
	'roomId',
	'propId',
	'sensorId',
	'outputId',
	'sceneId',
	'captureId',
	'personId',
	'positionId',
	'checkId',
	'clientId',
	'outcome',
	'firstNight',
	'nights',
	'doorsOpen',
	'confirmRemoval',
	'settings.kind',
	'settings.gapMm',
	'range.near',
	'curve.kind',
	'cues',
	'__proto__',
	'__proto__.notes',
	'constructor.prototype.x',
	'settings.__proto__.polluted',
	'a..b',
	'x\u0000y',
	''
];

const hostileText = fc.oneof(
	{ arbitrary: fc.string({ maxLength: 40, unit: 'binary' }), weight: 1 },
	// Text PostgreSQL cannot store, alone and inside ordinary text.
	{ arbitrary: fc.constantFrom('\u0000', '\ud800', 'a\udfffb', 'Crypt\u0000 2'), weight: 2 },
	{
		arbitrary: fc.constantFrom(
			'x'.repeat(5000),
			'1e309',
			'-0',
			'NaN',
			'Infinity',
			'2027-02-30',
			'25:61',
			'../../etc/passwd',
			"'; drop table props; --",
			'<script>alert(1)</script>',
			'on',
			'true',
			'[]',
			'{}'
		),
		weight: 1
	}
);

/** The generators, made once the venues exist (their ids are among the values). */
function generators() {
	/** An id from this venue, from another venue, or from nowhere. */
	const someId = (kind: string) =>
		fc.oneof(
			{ arbitrary: fc.constantFrom(...(here.ids[kind] ?? [randomUUID()])), weight: 4 },
			{ arbitrary: fc.constantFrom(...(there.ids[kind] ?? [randomUUID()])), weight: 1 },
			{ arbitrary: fc.uuid(), weight: 1 }
		);
	const anyId = () =>
		fc.oneof(...Object.keys(here.ids).map((k) => someId(k)), fc.uuid(), hostileText);

	const fieldValue = () => fc.oneof(hostileText, anyId(), fc.integer().map(String));

	const jsonValue = fc.letrec((tie) => ({
		value: fc.oneof(
			{ depthSize: 'small' },
			hostileText,
			anyId(),
			fc.double(),
			fc.integer(),
			fc.boolean(),
			fc.constant(null),
			fc.array(tie('value'), { maxLength: 4 }),
			fc.dictionary(fc.constantFrom(...FIELD_NAMES), tie('value'), { maxKeys: 5 })
		)
	})).value;

	// A plausible value for each field people fill in, so that most requests get past the first
	// check; one or two fields are then swapped for something hostile.
	const plausible: Record<string, fc.Arbitrary<string>> = {
		id: anyId(),
		name: fc.constantFrom('Crypt 2', 'Lantern', 'Mill race'),
		notes: fc.constantFrom('', 'Check the hinge'),
		kind: fc.constantFrom('button', 'capacitive', 'relay', 'led_string', 'haunt', 'safety'),
		email: fc.constantFrom('new@gloaming.test', 'Crew@Gloaming.Test'),
		role: fc.constantFrom('owner', 'designer', 'show_manager', 'crew'),
		date: fc.constantFrom('2027-10-01', '2027-10-02', '2030-10-31'),
		reason: fc.constant('Hinge broke'),
		label: fc.constant('Exits lit'),
		status: fc.constantFrom('scheduled', 'cancelled', 'dark'),
		call: fc.constantFrom('17:00', '18:30'),
		detach: fc.constant('on'),
		roomId: someId('room'),
		propId: someId('prop'),
		sensorId: someId('sensor'),
		outputId: someId('output'),
		sceneId: someId('scene'),
		personId: fc.uuid(),
		positionId: someId('position'),
		clientId: fc.uuid(),
		outcome: fc.constantFrom('pass', 'fail'),
		firstNight: fc.constant('2027-10-01'),
		nights: fc.constantFrom('FR', 'SA'),
		doorsOpen: fc.constant('19:00'),
		'settings.kind': fc.constantFrom('button', 'capacitive', 'pressure_mat'),
		'settings.gapMm': fc.constantFrom('3', '0', '-1'),
		'range.near': fc.constantFrom('1', '0.5'),
		'curve.kind': fc.constantFrom('gamma', 'cie', 'linear')
	};
	// Every field people fill in, each swapped for something hostile now and then, and one odd name.
	const names = Object.keys(plausible);
	const fields = fc
		.tuple(
			fc.tuple(
				...names.map((n) =>
					fc.oneof({ arbitrary: plausible[n], weight: 3 }, { arbitrary: hostileText, weight: 1 })
				)
			),
			fc.dictionary(fc.constantFrom(...FIELD_NAMES), fieldValue(), { maxKeys: 1 })
		)
		.map(([values, odd]) => ({
			...Object.fromEntries(names.map((n, i) => [n, values[i]])),
			...odd
		}));

	const body = fc.oneof(
		fc.record({ kind: fc.constant('fields' as const), value: fc.constant(null) }),
		fc.record({ kind: fc.constant('json' as const), value: jsonValue }),
		fc.record({ kind: fc.constant('raw' as const), value: hostileText }),
		fc.constant({ kind: 'none' as const, value: null })
	);

	const request = fc.record({
		actor: fc.constantFrom(
			'owner',
			'owner',
			'designer',
			'designer',
			'show_manager',
			'show_manager',
			'crew',
			'outsider',
			'signedOut'
		),
		/** The venue in the address: mostly this one, sometimes the other. */
		otherVenue: fc.integer({ min: 0, max: 7 }).map((n) => n === 0),
		paramIds: fc.array(fc.nat(), { minLength: 4, maxLength: 4 }),
		fields,
		body
	});
	return request;
}

const MEMBERS_HERE = ['owner', 'designer', 'show_manager', 'crew'];
const CALCULATORS = ['capacitive', 'led', 'relay', 'curve', 'nothing', '__proto__'];

function paramsFor(t: Target, otherVenue: boolean, picks: number[]) {
	const out: Record<string, string> = {};
	t.params.forEach((p, i) => {
		const n = picks[i % picks.length];
		if (p === 'venue') out.venue = (otherVenue ? there : here).venue.slug;
		else if (p === 'name') out.name = CALCULATORS[n % CALCULATORS.length];
		else {
			// Mostly this venue's own ids, so requests get past the look-up and into the work.
			const mine = here.ids[p] ?? [];
			const pool = [...mine, ...mine, ...mine, ...(there.ids[p] ?? []), randomUUID()];
			out[p] = pool[n % pool.length];
		}
	});
	return out;
}

/** The tables whose fingerprints differ between two. */
function changed(before: string, after: string) {
	const was = new Set(before.split(' '));
	return after
		.split(' ')
		.filter((t) => !was.has(t))
		.map((t) => t.split('=')[0])
		.join(', ');
}

type Request = ReturnType<typeof generators> extends fc.Arbitrary<infer T> ? T : never;

async function send(t: Target, r: Request): Promise<Answer> {
	const params = paramsFor(t, r.otherVenue, r.paramIds);
	const path = t.route.replace(/\[(\w+)(?:=\w+)?\]/g, (_, p: string) => params[p]);
	const person = actors[r.actor];
	if (t.action) return callAction(t.run as never, { path, params, person, form: r.fields });
	const query = t.method === 'GET' ? `?${new URLSearchParams(r.fields)}` : '';
	const call = { path: path + query, params, person, method: t.method };
	if (t.method === 'GET' || r.body.kind === 'none') return callHandler(t.run as never, call);
	if (r.body.kind === 'json') return callHandler(t.run as never, { ...call, json: r.body.value });
	if (r.body.kind === 'fields') return callHandler(t.run as never, { ...call, json: r.fields });
	return callHandler(t.run as never, {
		...call,
		body: String(r.body.value),
		headers: { 'content-type': 'application/json' }
	});
}

const tally: string[] = [];
afterAll(() => {
	if (process.env.FUZZ_DEBUG) console.log(tally.sort().join('\n'));
});

describe('generated hostile requests', () => {
	it(`to ${targets.length} routes and actions answer below 500 and leave other venues alone`, async () => {
		expect(targets.length).toBeGreaterThan(60);
		// The same number of requests for every target, so each gets its share however many there are.
		const perTarget = Math.max(1, Math.ceil(RUNS / targets.length));
		const requests = generators();
		let before = await fingerprints();
		for (const t of targets) {
			await fc.assert(
				fc.asyncProperty(requests, async (r) => {
					let answer: Answer;
					vi.spyOn(console, 'error').mockImplementation(() => {});
					try {
						answer = await send(t, r);
					} catch (e) {
						throw new Error(`${t.label} as ${r.actor} threw: ${(e as Error).message}`, {
							cause: e
						});
					} finally {
						vi.restoreAllMocks();
					}
					const said = `${t.label} as ${r.actor}: ${answer.status} ${JSON.stringify(answer.body)?.slice(0, 200)}`;
					if (process.env.FUZZ_DEBUG) tally.push(said);
					expect(answer.status, said).toBeLessThan(500);
					const after = await fingerprints();
					// The venue not in the address never changes; the one in it only through its members.
					const [addressed, other] = r.otherVenue
						? (['there', 'here'] as const)
						: (['here', 'there'] as const);
					const member = r.otherVenue ? r.actor === 'outsider' : MEMBERS_HERE.includes(r.actor);
					expect(
						after[other],
						`${said} changed another venue: ${changed(before[other], after[other])}`
					).toBe(before[other]);
					if (!member)
						expect(
							after[addressed],
							`${said} changed a venue it is not in: ${changed(before[addressed], after[addressed])}`
						).toBe(before[addressed]);
					before = after;
				}),
				{ numRuns: perTarget, seed: SEED, endOnFailure: true }
			);
		}
	}, 600_000);
});
