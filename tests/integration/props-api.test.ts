import { beforeAll, describe, expect, it, vi } from 'vitest';
import { eq, sql } from 'drizzle-orm';
import { controllers, propFiles, props } from '../../src/lib/server/db/schema';
import { MOVE_SHOW_BODY } from '../../src/lib/schemas/schedule';
import { makePerson, makeVenue, testDb } from './db';
import { asSession, callAction, callHandler, useTestEnv } from './routes';
import { PNG_1x1 } from './uploads';

// The JSON API and a few form actions, called as the server calls them (real Request, params and
// the venue hook), against the test database and the object-store fake.
// The app reads its settings through $env; here they come from the test's own process.env.
vi.mock('$env/dynamic/private', () => ({ env: process.env }));
useTestEnv();
const db = testDb();
const list = await import('../../src/routes/api/v/[venue]/props/+server');
const one = await import('../../src/routes/api/v/[venue]/props/[prop=uuid]/+server');
const sensorsApi = await import('../../src/routes/api/v/[venue]/props/[prop=uuid]/sensors/+server');
const filesApi = await import('../../src/routes/api/v/[venue]/props/[prop=uuid]/files/+server');
const calendarApi = await import('../../src/routes/api/v/[venue]/calendar/+server');
const controllersPage = await import('../../src/routes/(app)/v/[venue]/controllers/+page.server');

let slug: string;
let venueId: string;
let designer: ReturnType<typeof asSession>;
let manager: ReturnType<typeof asSession>;
let crew: ReturnType<typeof asSession>;
let outsider: ReturnType<typeof asSession>;
let otherSlug: string;
let otherPropId: string;

beforeAll(async () => {
	const [d, m, c, o] = await Promise.all(
		['Designer', 'Manager', 'Crew', 'Outsider'].map((n) => makePerson(db, n))
	);
	const { venue } = await makeVenue(db, [
		[d.id, 'designer'],
		[m.id, 'show_manager'],
		[c.id, 'crew']
	]);
	const { venue: other } = await makeVenue(db, [
		[o.id, 'owner'],
		[d.id, 'designer']
	]);
	const [op] = await db.insert(props).values({ venueId: other.id, name: 'Not yours' }).returning();
	slug = venue.slug;
	venueId = venue.id;
	otherSlug = other.slug;
	otherPropId = op.id;
	[designer, manager, crew, outsider] = [d, m, c, o].map(asSession);
});

const base = () => `/api/v/${slug}/props`;

describe('props API', () => {
	it('lets a designer create, read and change a prop', async () => {
		const made = await callHandler(list.POST as never, {
			path: base(),
			params: { venue: slug },
			person: designer,
			json: { name: 'Lantern post', status: 'bench', notes: 'Left of the gate' }
		});
		expect(made.status).toBe(201);
		const prop = made.body!.prop as { id: string; name: string; status: string };
		expect(prop).toMatchObject({ name: 'Lantern post', status: 'bench' });

		const read = await callHandler(one.GET as never, {
			path: `${base()}/${prop.id}`,
			params: { venue: slug, prop: prop.id },
			person: crew
		});
		expect(read.status).toBe(200);
		expect(read.body).toMatchObject({ prop: { name: 'Lantern post' }, sensors: [], files: [] });

		const changed = await callHandler(one.PUT as never, {
			path: `${base()}/${prop.id}`,
			method: 'PUT',
			params: { venue: slug, prop: prop.id },
			person: designer,
			json: { name: 'Lantern post (east)', status: 'installed' }
		});
		expect(changed.status).toBe(200);
		expect(changed.body).toMatchObject({
			prop: { name: 'Lantern post (east)', status: 'installed' }
		});

		const listed = await callHandler(list.GET as never, {
			path: `${base()}?q=lantern`,
			params: { venue: slug },
			person: manager
		});
		expect(listed.status).toBe(200);
		expect((listed.body!.rows as { name: string }[]).map((r) => r.name)).toContain(
			'Lantern post (east)'
		);
	});

	it('answers 401 signed out, 404 to non-members and 403 to members without the role', async () => {
		const body = { name: 'Sneaky' };
		const signedOut = await callHandler(list.POST as never, {
			path: base(),
			params: { venue: slug },
			person: null,
			json: body
		});
		expect(signedOut.status).toBe(401);
		const stranger = await callHandler(list.GET as never, {
			path: base(),
			params: { venue: slug },
			person: outsider
		});
		expect(stranger.status).toBe(404);
		for (const who of [crew, manager]) {
			const refused = await callHandler(list.POST as never, {
				path: base(),
				params: { venue: slug },
				person: who,
				json: body
			});
			expect(refused.status).toBe(403);
			expect(String(refused.body!.message)).toMatch(/This needs one of these roles/);
		}
		const [n] = await db
			.select({ n: sql<number>`count(*)::int` })
			.from(props)
			.where(eq(props.name, 'Sneaky'));
		expect(n.n).toBe(0);
	});

	it("answers 404 for another venue's prop, even to someone who belongs to both", async () => {
		const read = await callHandler(one.GET as never, {
			path: `${base()}/${otherPropId}`,
			params: { venue: slug, prop: otherPropId },
			person: designer
		});
		expect(read.status).toBe(404);
		const upload = await callHandler(filesApi.POST as never, {
			path: `${base()}/${otherPropId}/files?filename=a.png`,
			params: { venue: slug, prop: otherPropId },
			person: designer,
			body: new Uint8Array(PNG_1x1)
		});
		expect(upload.status).toBe(404);
		expect(otherSlug).not.toBe(slug);
	});

	it('answers bad bodies with 400 and a message per field', async () => {
		const none = await callHandler(list.POST as never, {
			path: base(),
			params: { venue: slug },
			person: designer,
			body: 'not json',
			headers: { 'content-type': 'application/json' }
		});
		expect(none.status).toBe(400);
		expect(none.body!.message).toBe('Send a JSON body.');

		// JSON, but null: the answer says what shape is wanted, not the checker's own words.
		const empty = await callHandler(list.POST as never, {
			path: base(),
			params: { venue: slug },
			person: designer,
			body: 'null',
			headers: { 'content-type': 'application/json' }
		});
		expect(empty.status).toBe(400);
		expect(empty.body!.message).toMatch(/^Send a JSON object with the fields by name/);

		const bad = await callHandler(list.POST as never, {
			path: base(),
			params: { venue: slug },
			person: designer,
			json: { name: '', status: 'on fire', controllerId: 'abc' }
		});
		expect(bad.status).toBe(400);
		const errors = bad.body!.errors as Record<string, string[]>;
		expect(Object.keys(errors).sort()).toEqual(['controllerId', 'name', 'status']);
		expect(errors.status[0]).toBe('Choose a status.');

		const [mine] = await db.insert(props).values({ venueId, name: 'Fog box' }).returning();
		const sensor = await callHandler(sensorsApi.POST as never, {
			path: `${base()}/${mine.id}/sensors`,
			params: { venue: slug, prop: mine.id },
			person: designer,
			json: { name: 'Plate', settings: { kind: 'capacitive', gapMm: -3 }, range: {} }
		});
		expect(sensor.status).toBe(400);
		expect(Object.keys(sensor.body!.errors as object)).toContain('settings.gapMm');
	});

	it('refuses uploads that are too big or not what they claim, storing nothing', async () => {
		const [mine] = await db.insert(props).values({ venueId, name: 'Mirror' }).returning();
		const at = {
			path: `${base()}/${mine.id}/files?filename=mirror.png`,
			params: { venue: slug, prop: mine.id }
		};
		const fake = await callHandler(filesApi.POST as never, {
			...at,
			person: designer,
			body: 'a text file named like a photo'
		});
		expect(fake.status).toBe(415);
		expect(fake.body!.message).toMatch(/photo \(PNG, JPEG or WebP\) or a wiring PDF/);

		const big = new Uint8Array(10 * 1024 * 1024 + 10);
		big.set(PNG_1x1);
		const huge = await callHandler(filesApi.POST as never, { ...at, person: designer, body: big });
		expect(huge.status).toBe(413);
		expect(huge.body!.message).toBe('Photos may be at most 10 MB.');

		const byCrew = await callHandler(filesApi.POST as never, {
			...at,
			person: crew,
			body: new Uint8Array(PNG_1x1)
		});
		expect(byCrew.status).toBe(403);
		const stored = await db.select().from(propFiles).where(eq(propFiles.propId, mine.id));
		expect(stored).toEqual([]);

		const good = await callHandler(filesApi.POST as never, {
			...at,
			person: designer,
			body: new Uint8Array(PNG_1x1)
		});
		expect(good.status).toBe(201);
		expect(good.body!.file).toMatchObject({ kind: 'photo', contentType: 'image/png' });
		expect(good.body!.file).not.toHaveProperty('objectKey');
	});
});

describe('calendar API', () => {
	it('asks for a JSON body in plain words when none is sent', async () => {
		const res = await callHandler(calendarApi.POST as never, {
			path: `/api/v/${slug}/calendar`,
			params: { venue: slug },
			person: manager,
			method: 'POST'
		});
		expect(res.status).toBe(400);
		expect(res.body!.message).toBe(MOVE_SHOW_BODY);
	});
});

describe('controllers page', () => {
	const fields = {
		name: 'Gate board',
		supplyV: '5',
		clockHz: '16000000',
		timerBits: '16',
		pwmBits: '8',
		prescaler: '64',
		referenceV: '1.1',
		pinLimitMa: '20',
		supplyRatingA: '2'
	};
	const at = () => ({ path: `/v/${slug}/controllers`, params: { venue: slug } });
	async function gateBoard() {
		const numbers = Object.entries(fields).map(([k, v]) => [k, k === 'name' ? v : Number(v)]);
		const [c] = await db
			.insert(controllers)
			.values({ venueId, ...Object.fromEntries(numbers) } as typeof controllers.$inferInsert)
			.returning();
		return c;
	}

	it('changes a controller with the same checks as adding one', async () => {
		const c = await gateBoard();
		const bad = await callAction(controllersPage.actions.save as never, {
			...at(),
			person: designer,
			form: { ...fields, id: c.id, referenceV: '9' }
		});
		expect(bad.status).toBe(400);
		expect(bad.body).toMatchObject({
			editing: c.id,
			values: { referenceV: '9' },
			errors: { referenceV: ['The comparator reference must be below the supply voltage.'] }
		});
		const byCrew = await callAction(controllersPage.actions.save as never, {
			...at(),
			person: crew,
			form: { ...fields, id: c.id }
		});
		expect(byCrew.status).toBe(403);
		const ok = await callAction(controllersPage.actions.save as never, {
			...at(),
			person: designer,
			form: { ...fields, id: c.id, name: 'Gate board v2', pwmBits: '10' }
		});
		expect(ok.status).toBe(200);
		const [saved] = await db.select().from(controllers).where(eq(controllers.id, c.id));
		expect(saved).toMatchObject({ name: 'Gate board v2', pwmBits: 10 });
	});

	it('will not remove a controller props still use, unless asked to set them to none', async () => {
		const c = await gateBoard();
		const [p] = await db
			.insert(props)
			.values({ venueId, name: 'Gate skull', controllerId: c.id })
			.returning();
		const blocked = await callAction(controllersPage.actions.remove as never, {
			...at(),
			person: designer,
			form: { id: c.id }
		});
		expect(blocked.status).toBe(409);
		expect(blocked.body!.message).toBe(
			'Gate board is still used by a prop (Gate skull). Move it to another controller first, or tick “Set its prop to no controller” and remove again.'
		);
		expect(await db.select().from(controllers).where(eq(controllers.id, c.id))).toHaveLength(1);
		const done = await callAction(controllersPage.actions.remove as never, {
			...at(),
			person: designer,
			form: { id: c.id, detach: 'on' }
		});
		expect(done.status).toBe(200);
		expect(await db.select().from(controllers).where(eq(controllers.id, c.id))).toEqual([]);
		const [after] = await db.select().from(props).where(eq(props.id, p.id));
		expect(after.controllerId).toBeNull();
	});
});
