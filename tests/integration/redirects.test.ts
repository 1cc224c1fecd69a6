import { describe, expect, it, vi } from 'vitest';
import { makePerson, testDb } from './db';
import { asSession, callHandler, useTestEnv } from './routes';

// Targets that came from the request never send the browser to another site.
vi.mock('$env/dynamic/private', () => ({ env: process.env }));
useTestEnv();
const db = testDb();
const signInPage = await import('../../src/routes/(auth)/sign-in/+page.server');
const themeRoute = await import('../../src/routes/theme/+server');
const { passwordSignInSchema } = await import('../../src/lib/schemas/auth');

const hostile = [
	'/%5Cevil.example',
	'//evil.example',
	'/\\evil.example',
	'/%2F%2Fevil.example',
	'https://evil.example/venues'
];

describe('redirects after signing in', () => {
	it.each(hostile)('a signed-in visit to /sign-in?redirectTo=%s stays on the site', async (t) => {
		const person = asSession(await makePerson(db));
		const res = await callHandler(signInPage.load as never, {
			path: `/sign-in?redirectTo=${encodeURIComponent(t)}`,
			params: {},
			person
		});
		expect(res.status).toBe(303);
		expect(res.location).toBe('/venues');
	});

	it('a raw %5C in the query string is decoded to a backslash and still refused', async () => {
		const person = asSession(await makePerson(db));
		const res = await callHandler(signInPage.load as never, {
			path: '/sign-in?redirectTo=/%5Cevil.example',
			params: {},
			person
		});
		expect(res.location).toBe('/venues');
		const kept = await callHandler(signInPage.load as never, {
			path: '/sign-in?redirectTo=%2Fv%2Fold-mill',
			params: {},
			person
		});
		expect(kept.location).toBe('/v/old-mill');
	});

	it.each(hostile)('the sign-in forms turn redirectTo=%s into a site path', (t) => {
		const parsed = passwordSignInSchema.parse({
			email: 'a@gloaming.test',
			password: 'x',
			redirectTo: t
		});
		expect(parsed.redirectTo).toBe('/');
	});

	it('the theme switch goes back only to a page of this site', async () => {
		const post = (referer: string) =>
			callHandler(themeRoute.POST as never, {
				path: '/theme',
				params: {},
				person: null,
				body: new URLSearchParams({ theme: 'low-light' }),
				headers: { referer, 'content-type': 'application/x-www-form-urlencoded' }
			});
		expect((await post('http://127.0.0.1//evil.example/x')).location).toBe('/');
		expect((await post('http://127.0.0.1/%5Cevil.example')).location).toBe('/');
		expect((await post('https://evil.example/v/mill')).location).toBe('/');
		expect((await post('not a url at all')).location).toBe('/');
		expect((await post('http://127.0.0.1/v/mill?tab=crew')).location).toBe('/v/mill?tab=crew');
	});
});
