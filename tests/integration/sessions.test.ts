import { describe, expect, it, vi } from 'vitest';
import { randomUUID } from 'node:crypto';
import { eq } from 'drizzle-orm';
import { drizzle } from 'drizzle-orm/postgres-js';
import postgres from 'postgres';
import { encode } from '@auth/core/jwt';
import { inject } from 'vitest';
import * as schema from '../../src/lib/server/db/schema';
import { sessions, users } from '../../src/lib/server/db/schema';
import { Browser } from './browser';
import { makeVenue, testDb } from './db';
import { useTestEnv } from './routes';

// Sessions are rows: a token copied before sign-out, a password change or removal from one's last
// venue is refused afterwards, and one left idle for 14 days ends.
vi.mock('$env/dynamic/private', () => ({ env: process.env }));
useTestEnv();
process.env.ORIGIN = 'http://127.0.0.1:5510';
process.env.AUTH_SECRET = 'test-secret-for-sessions-0123456789abcdef';
const signInPage = await import('../../src/routes/(auth)/sign-in/+page.server');
const signOutPage = await import('../../src/routes/(auth)/sign-out/+page.server');
const { hashPassword } = await import('../../src/lib/server/auth/password');
const { findSession, SESSION_IDLE_DAYS } = await import('../../src/lib/server/auth/sessions');
const { removeMember } = await import('../../src/lib/server/venues/members');

const db = testDb();
const PASSWORD = 'fog-machine-at-dusk';
const hashed = hashPassword(PASSWORD);
const COOKIE = 'authjs.session-token';
const DAY = 24 * 60 * 60 * 1000;

let clients = 0;
async function signedIn(email?: string) {
	if (!email) {
		email = `session-${randomUUID()}@gloaming.test`;
		await db.insert(users).values({ email, name: 'Session Test', passwordHash: await hashed });
	}
	const browser = new Browser(`10.88.0.${++clients}`);
	const res = await browser.action(signInPage.actions.password as never, '/sign-in?/password', {
		email,
		password: PASSWORD,
		redirectTo: '/venues'
	});
	expect(res.status).toBe(302);
	const [person] = await db.select().from(users).where(eq(users.email, email));
	return { browser, person, email };
}

/** Another browser holding a copy of this one's cookies, as a stolen cookie would be. */
function copyOf(browser: Browser) {
	const copy = new Browser('10.88.1.1');
	copy.jar = new Map(browser.jar);
	return copy;
}

describe('sessions', () => {
	it('signing out ends that session; a copied token is refused, other devices stay in', async () => {
		const { browser, email } = await signedIn();
		const { browser: phone } = await signedIn(email);
		const copy = copyOf(browser);
		expect((await copy.person())?.email).toBe(email);
		const out = await browser.action(signOutPage.actions.default as never, '/sign-out', {});
		expect(out.status).toBe(302);
		expect(browser.jar.has(COOKIE)).toBe(false);
		expect(await copy.person()).toBeNull();
		expect((await phone.person())?.email).toBe(email);
	});

	it("Auth.js's own sign-out route ends the session too", async () => {
		const { browser } = await signedIn();
		const copy = copyOf(browser);
		const out = await browser.postAuth('/auth/signout', {});
		expect(out.status).toBe(302);
		expect(await copy.person()).toBeNull();
	});

	it('a new password ends every session of the person', async () => {
		const { browser, person } = await signedIn();
		const { browser: phone } = await signedIn(person.email);
		const copy = copyOf(browser);
		// Saving the same hash again is no change and ends nothing.
		await db
			.update(users)
			.set({ passwordHash: person.passwordHash })
			.where(eq(users.id, person.id));
		expect((await copy.person())?.email).toBe(person.email);
		await db
			.update(users)
			.set({ passwordHash: await hashPassword('a-brand-new-password') })
			.where(eq(users.id, person.id));
		expect(await copy.person()).toBeNull();
		expect(await phone.person()).toBeNull();
	});

	it('removal from one venue keeps the session; removal from the last one ends it', async () => {
		const { browser, person } = await signedIn();
		const owner = await signedIn();
		const a = await makeVenue(db, [
			[owner.person.id, 'owner'],
			[person.id, 'crew']
		]);
		const b = await makeVenue(db, [
			[owner.person.id, 'owner'],
			[person.id, 'designer']
		]);
		const copy = copyOf(browser);
		await removeMember(db, a.venue.id, a.memberships[1].id, owner.person.id);
		expect((await copy.person())?.email).toBe(person.email);
		await removeMember(db, b.venue.id, b.memberships[1].id, owner.person.id);
		expect(await copy.person()).toBeNull();
		expect(await browser.person()).toBeNull();
		// The owner, still in both venues, is untouched.
		expect((await owner.browser.person())?.email).toBe(owner.email);
	});

	it('removing the account ends its sessions', async () => {
		const { browser, person } = await signedIn();
		await db.delete(users).where(eq(users.id, person.id));
		expect(await browser.person()).toBeNull();
		expect(await db.select().from(sessions).where(eq(sessions.userId, person.id))).toEqual([]);
	});

	it('an idle session ends; one in use is renewed at most once a day', async () => {
		const { browser, person } = await signedIn();
		const [row] = await db.select().from(sessions).where(eq(sessions.userId, person.id));
		// Just signed in: fourteen days ahead, and an ordinary request sets no cookie.
		expect(row.expires.getTime() - Date.now()).toBeGreaterThan((SESSION_IDLE_DAYS - 1) * DAY);
		const plain = await browser.fetch('/venues');
		expect(plain.person).toBeTruthy();
		expect(plain.setCookies).toEqual([]);

		// Last renewed two days ago: this request pushes the end back and re-sets the cookie.
		await db
			.update(sessions)
			.set({ expires: new Date(Date.now() + (SESSION_IDLE_DAYS - 2) * DAY) })
			.where(eq(sessions.userId, person.id));
		const renewed = await browser.fetch('/venues');
		expect(renewed.setCookies).toEqual([COOKIE]);
		const [after] = await db.select().from(sessions).where(eq(sessions.userId, person.id));
		expect(after.expires.getTime() - Date.now()).toBeGreaterThan((SESSION_IDLE_DAYS - 1) * DAY);

		// Fourteen days without use: gone.
		await db
			.update(sessions)
			.set({ expires: new Date(Date.now() - 1000) })
			.where(eq(sessions.userId, person.id));
		expect(await browser.person()).toBeNull();
	});

	it('a stateless token of the kind issued before is refused', async () => {
		const { person } = await signedIn();
		const forged = await encode({
			token: { sub: person.id, email: person.email },
			secret: process.env.AUTH_SECRET!,
			salt: COOKIE
		});
		const browser = new Browser('10.88.2.1');
		browser.jar.set(COOKIE, forged);
		expect(await browser.person()).toBeNull();
	});

	it('resolving the person costs one query', async () => {
		const { browser } = await signedIn();
		let queries = 0;
		const sql = postgres(inject('databaseUrl'), { max: 1 });
		const counted = drizzle(sql, { schema, logger: { logQuery: () => void queries++ } });
		try {
			const found = await findSession(counted, browser.jar.get(COOKIE));
			expect(found?.person.id).toBeTruthy();
			expect(queries).toBe(1);
		} finally {
			await sql.end();
		}
	});
});
