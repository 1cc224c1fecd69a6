import { afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import { randomUUID } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { checkResults, checks, propFiles, props, shows } from '../../src/lib/server/db/schema';
import { photoPrefix } from '../../src/lib/server/checklists/record';
import { makePerson, makeVenue, testDb } from './db';
import { asSession, callHandler, useTestEnv } from './routes';

// Requests that used to end as server errors get a plain 4xx instead: a reserved or inherited
// action name, a Referer that is not an address, a stored file or photo the store never got;
// and a fault of ours is answered in plain words with a reference that is also logged.
vi.mock('$env/dynamic/private', () => ({ env: process.env }));
useTestEnv();
const db = testDb();
const theme = await import('../../src/routes/theme/+server');
const fileRoute =
	await import('../../src/routes/(app)/v/[venue]/props/[prop=uuid]/files/[file=uuid]/+server');
const photoRoute =
	await import('../../src/routes/(app)/v/[venue]/shows/[show=uuid]/checklist/photos/[result=uuid]/+server');
const { inputHandle } = await import('../../src/lib/server/hooks/input');
const { handleError } = await import('../../src/lib/server/hooks/errors');

let slug: string;
let venueId: string;
let manager: ReturnType<typeof asSession>;

beforeAll(async () => {
	const m = await makePerson(db, 'Manager');
	const { venue } = await makeVenue(db, [[m.id, 'show_manager']]);
	slug = venue.slug;
	venueId = venue.id;
	manager = asSession(m);
});

afterEach(() => vi.restoreAllMocks());

describe('refused cleanly', () => {
	it('the theme route sends a bad or foreign Referer home and a good one back', async () => {
		const post = (referer?: string) =>
			callHandler(theme.POST as never, {
				path: '/theme',
				params: {},
				person: null,
				body: new URLSearchParams({ theme: 'low-light' }),
				headers: referer ? { referer } : {}
			});
		expect(await post('not an address')).toMatchObject({ status: 303, location: '/' });
		expect(await post('http://[::1')).toMatchObject({ status: 303, location: '/' });
		expect(await post('https://elsewhere.example/v/x')).toMatchObject({
			status: 303,
			location: '/'
		});
		expect(await post('http://127.0.0.1/v/crypt/rooms?x=1')).toMatchObject({
			status: 303,
			location: '/v/crypt/rooms?x=1'
		});
		expect(await post()).toMatchObject({ status: 303, location: '/' });
	});

	it('a reserved or inherited action name is an unknown action (404)', async () => {
		const resolve = vi.fn(async () => new Response('ok'));
		const post = (search: string) =>
			(async () =>
				inputHandle({
					event: {
						params: { venue: slug },
						url: new URL(`/v/${slug}/rooms${search}`, 'http://127.0.0.1'),
						request: new Request(`http://127.0.0.1/v/${slug}/rooms${search}`, { method: 'POST' })
					},
					resolve
				} as never))().then(
				(r) => (r as Response).status,
				(e: { status?: number }) => e.status
			);
		for (const name of ['default', 'constructor', 'toString', '__proto__', 'hasOwnProperty'])
			expect(await post(`?/${name}`), name).toBe(404);
		expect(await post('?/add')).toBe(200);
		expect(await post('')).toBe(200);
		expect(resolve).toHaveBeenCalledTimes(2);
	});

	it('a prop file whose object was never stored is a 404 with a message', async () => {
		const [p] = await db.insert(props).values({ venueId, name: 'Well' }).returning();
		const [f] = await db
			.insert(propFiles)
			.values({
				venueId,
				propId: p.id,
				kind: 'photo',
				objectKey: `venues/${venueId}/props/${p.id}/${randomUUID()}.png`,
				filename: 'well.png',
				contentType: 'image/png',
				sizeBytes: 10,
				sha256: '0'.repeat(64)
			})
			.returning();
		const answer = await callHandler(fileRoute.GET as never, {
			path: `/v/${slug}/props/${p.id}/files/${f.id}`,
			params: { venue: slug, prop: p.id, file: f.id },
			person: manager
		});
		expect(answer).toMatchObject({
			status: 404,
			body: { message: 'That file is no longer stored. Upload it again.' }
		});
	});

	it('a check photo the store never got is a 404 with a message', async () => {
		const d = '2027-10-01';
		const [show] = await db
			.insert(shows)
			.values({
				venueId,
				date: d,
				doorsOpen: new Date(`${d}T18:00:00Z`),
				doorsClose: new Date(`${d}T22:00:00Z`),
				crewCall: new Date(`${d}T16:00:00Z`)
			})
			.returning();
		const [check] = await db
			.insert(checks)
			.values({
				venueId,
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
				venueId,
				showId: show.id,
				checkId: check.id,
				outcome: 'pass',
				photoKey: `${photoPrefix(venueId, show.id)}${randomUUID()}.jpg`,
				clientId: randomUUID()
			})
			.returning();
		const answer = await callHandler(photoRoute.GET as never, {
			path: `/v/${slug}/shows/${show.id}/checklist/photos/${result.id}`,
			params: { venue: slug, show: show.id, result: result.id },
			person: manager
		});
		expect(answer).toMatchObject({
			status: 404,
			body: { message: 'That photo was never stored, or has been removed. Take it again.' }
		});
	});
});

describe('unexpected errors', () => {
	const event = {
		request: new Request('http://127.0.0.1/v/x/rooms', { method: 'POST' }),
		url: new URL('http://127.0.0.1/v/x/rooms'),
		route: { id: '/(app)/v/[venue]/rooms' }
	};

	it('go through the app-wide hook', () => {
		expect(readFileSync('src/hooks.server.ts', 'utf8')).toMatch(/^export \{ handleError \};$/m);
	});

	it('are logged with a short reference and answered in plain words with it', () => {
		const log = vi.spyOn(console, 'error').mockImplementation(() => {});
		const fault = new Error('relation "rooms" does not exist at character 15');
		const answer = handleError({ error: fault, event, status: 500, message: 'Internal' } as never);
		const { message, code } = answer as { message: string; code: string };
		expect(code).toMatch(/^[0-9a-f]{6}$/);
		expect(message).toBe(`Something went wrong on our side. Reference: ${code}`);
		expect(message).not.toContain('relation');
		expect(log).toHaveBeenCalledOnce();
		expect(String(log.mock.calls[0][0])).toContain(code);
		expect(log.mock.calls[0][1]).toBe(fault);
		// A second fault gets its own reference.
		const again = handleError({ error: fault, event, status: 500, message: 'x' } as never) as {
			code: string;
		};
		expect(again.code).not.toBe(code);
	});

	it("the framework's own refusals get plain words, not its English, and are not logged", () => {
		const log = vi.spyOn(console, 'error').mockImplementation(() => {});
		const notFound = handleError({
			error: new Error('Not found: /nowhere'),
			event,
			status: 404,
			message: 'Not Found'
		} as never) as { message: string };
		expect(notFound.message).toBe(
			'There is nothing at this address. Check the link, or go back to your venues.'
		);
		const wrongType = handleError({
			error: new Error('Form actions expect form-encoded data'),
			event,
			status: 415,
			message: 'Unsupported Media Type'
		} as never) as { message: string };
		expect(wrongType.message).toMatch(/not sent the way this page expects/);
		expect(log).not.toHaveBeenCalled();
	});
});
