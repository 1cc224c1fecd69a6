import { beforeAll, describe, expect, it, vi } from 'vitest';
import { eq } from 'drizzle-orm';
import { props, rooms, sensors } from '../../src/lib/server/db/schema';
import { UNSTORABLE_TEXT } from '../../src/lib/server/text';
import { makePerson, makeVenue, testDb } from './db';
import { asSession, callAction, callHandler, useTestEnv } from './routes';

// Text PostgreSQL cannot store (a NUL; half a surrogate pair in jsonb) is refused beside the field,
// never passed on to the database as a server error.
vi.mock('$env/dynamic/private', () => ({ env: process.env }));
useTestEnv();
const db = testDb();
const roomsPage = await import('../../src/routes/(app)/v/[venue]/rooms/+page.server');
const propPage = await import('../../src/routes/(app)/v/[venue]/props/[prop=uuid]/+page.server');
const propsApi = await import('../../src/routes/api/v/[venue]/props/+server');
const { inputHandle } = await import('../../src/lib/server/hooks/input');

let slug: string;
let venueId: string;
let propId: string;
let designer: ReturnType<typeof asSession>;

beforeAll(async () => {
	const d = await makePerson(db, 'Designer');
	const { venue } = await makeVenue(db, [[d.id, 'designer']]);
	const [p] = await db.insert(props).values({ venueId: venue.id, name: 'Well' }).returning();
	slug = venue.slug;
	venueId = venue.id;
	propId = p.id;
	designer = asSession(d);
});

describe('text that cannot be stored', () => {
	it('is refused in a form field with a message beside it, and nothing is stored', async () => {
		const answer = await callAction(roomsPage.actions.add as never, {
			path: `/v/${slug}/rooms?/add`,
			params: { venue: slug },
			person: designer,
			form: { name: 'Crypt\u0000', notes: 'ok' }
		});
		expect(answer.status).toBe(400);
		expect(answer.body).toMatchObject({ errors: { name: [UNSTORABLE_TEXT] } });
		expect(await db.select().from(rooms).where(eq(rooms.venueId, venueId))).toEqual([]);
	});

	it('is refused in a dotted (nested) form field', async () => {
		const fields = {
			name: 'Step',
			'settings.kind': 'pressure_mat',
			'settings.zones': '2',
			'range.debounceMs': '0',
			'range.rearmMs': '0'
		};
		const add = (form: Record<string, string>) =>
			callAction(propPage.actions.addSensor as never, {
				path: `/v/${slug}/props/${propId}?/addSensor`,
				params: { venue: slug, prop: propId },
				person: designer,
				form
			});
		const bad = await add({ ...fields, name: 'Step\u0000' });
		expect(bad.status).toBe(400);
		expect(bad.body).toMatchObject({ errors: { name: [UNSTORABLE_TEXT] } });
		expect(await db.select().from(sensors).where(eq(sensors.propId, propId))).toEqual([]);
		// The same form without the character is stored.
		expect((await add(fields)).status).toBe(200);
		expect(await db.select().from(sensors).where(eq(sensors.propId, propId))).toHaveLength(1);
	});

	it('is refused in a JSON body: an escaped NUL, a lone surrogate, and a bad key', async () => {
		for (const [text, field] of [
			['{"name": "Lantern", "notes": "a\\u0000b"}', 'notes'],
			['{"name": "Lantern \\ud800"}', 'name'],
			['{"name": "Lantern", "x\\u0000": 1}', 'form']
		]) {
			const answer = await callHandler(propsApi.POST as never, {
				path: `/api/v/${slug}/props`,
				params: { venue: slug },
				person: designer,
				body: text,
				headers: { 'content-type': 'application/json' }
			});
			expect(answer.status, text).toBe(400);
			expect(answer.body, text).toMatchObject({ errors: { [field]: [UNSTORABLE_TEXT] } });
		}
		const stored = await db.select().from(props).where(eq(props.venueId, venueId));
		expect(stored.map((p) => p.name)).toEqual(['Well']);
	});

	it('keeps a well-formed pair (an emoji) and other unusual text', async () => {
		const answer = await callHandler(propsApi.POST as never, {
			path: `/api/v/${slug}/props`,
			params: { venue: slug },
			person: designer,
			json: { name: 'Lantern 🎃 \u200b\u202e', notes: 'tab\tnew\nline' }
		});
		expect(answer.status).toBe(201);
		expect(answer.body).toMatchObject({ prop: { name: 'Lantern 🎃 \u200b\u202e' } });
	});

	it('is refused in a path or query before any lookup (a 400, not a server error)', async () => {
		const resolve = vi.fn(async () => new Response('ok'));
		const run = (params: Record<string, string>, path: string) =>
			(async () =>
				inputHandle({
					event: {
						params,
						url: new URL(path, 'http://127.0.0.1'),
						request: new Request('http://127.0.0.1')
					},
					resolve
				} as never))().then(
				(r) => (r as Response).status,
				(e: { status?: number; body?: { message: string } }) => e.status
			);
		expect(await run({ venue: 'a\u0000b' }, '/v/a%00b/rooms')).toBe(400);
		expect(await run({ venue: slug }, `/api/v/${slug}/calendar?start=%00`)).toBe(400);
		expect(await run({ venue: slug }, `/api/v/${slug}/calendar?%ED%A0%80=1`)).toBe(200);
		expect(await run({ venue: slug }, `/api/v/${slug}/calendar?start=2027-10-01`)).toBe(200);
		expect(resolve).toHaveBeenCalledTimes(2);
		// Without the hook (as in these tests), the venue lookup itself does not reach the database.
		const direct = await callHandler(propsApi.GET as never, {
			path: `/api/v/x/props`,
			params: { venue: 'x\u0000' },
			person: designer
		});
		expect(direct.status).toBe(404);
	});
});
