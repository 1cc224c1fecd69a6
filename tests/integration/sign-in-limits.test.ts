import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { randomUUID } from 'node:crypto';
import type { ChildProcess } from 'node:child_process';
import { and, eq } from 'drizzle-orm';
import { signInLimits, users, verificationTokens } from '../../src/lib/server/db/schema';
import { Browser } from './browser';
import { caught, catcherSmtpPort, startCatcher, stopCatcher } from './catcher';
import { testDb } from './db';
import { useTestEnv } from './routes';

// One limiter in front of every way in: the sign-in page's forms and Auth.js's own routes.
vi.mock('$env/dynamic/private', () => ({ env: process.env }));
useTestEnv();
process.env.ORIGIN = 'http://127.0.0.1:5510';
process.env.AUTH_SECRET = 'test-secret-for-sign-in-limits-0123456789';
process.env.SMTP_HOST = '127.0.0.1';
process.env.SMTP_PORT = String(catcherSmtpPort);
const signInPage = await import('../../src/routes/(auth)/sign-in/+page.server');
const { hashPassword } = await import('../../src/lib/server/auth/password');
const { SIGN_IN_LIMITS, takeSignInTry, waitAfter, waitWords } =
	await import('../../src/lib/server/auth/limits');
const { authPost } = await import('../../src/auth');

const db = testDb();
const PASSWORD = 'lantern-dusk-correct';
const FREE = SIGN_IN_LIMITS.password.person.free;

let catcher: ChildProcess;
beforeAll(async () => {
	catcher = await startCatcher();
}, 30_000);
afterAll(async () => {
	await stopCatcher(catcher);
});

const hashed = hashPassword(PASSWORD);
async function personWithPassword() {
	const email = `limits-${randomUUID()}@gloaming.test`;
	await db.insert(users).values({ email, name: 'Limit Test', passwordHash: await hashed });
	return email;
}

let clients = 0;
/** A fresh client address per test, so tests do not share a client's count. */
const newClient = () => `10.77.${Math.floor(++clients / 250)}.${clients % 250}`;

function tryPassword(browser: Browser, email: string, password: string) {
	return browser.action(signInPage.actions.password as never, '/sign-in?/password', {
		providerId: 'credentials',
		email,
		password,
		redirectTo: '/venues'
	});
}

async function mailTo(email: string) {
	for (let i = 0; i < 50; i++) {
		const [mail] = await caught(email);
		if (mail) return mail;
		await new Promise((r) => setTimeout(r, 100));
	}
	throw new Error(`no mail reached ${email}`);
}

async function limitRow(scope: 'password:person' | 'link:person', key: string) {
	const [row] = await db
		.select()
		.from(signInLimits)
		.where(and(eq(signInLimits.scope, scope), eq(signInLimits.key, key)));
	return row;
}

describe('the wait schedule', () => {
	it('lets the free tries through, then doubles each wait up to the ceiling', () => {
		const rule = { free: 5, firstWait: 2, longestWait: 600, forgetAfter: 3600 };
		// Worked by hand: tries 1-4 wait nothing; the 5th waits 2 s, then 4, 8, … capped at 600.
		expect([1, 2, 3, 4, 5, 6, 7, 8].map((n) => waitAfter(n, rule))).toEqual([
			0, 0, 0, 0, 2, 4, 8, 16
		]);
		expect(waitAfter(14, rule)).toBe(600); // 2 * 2^9 = 1024 > 600
		expect(waitWords(1)).toBe('1 second');
		expect(waitWords(7.2)).toBe('8 seconds');
		expect(waitWords(119)).toBe('119 seconds');
		expect(waitWords(600)).toBe('10 minutes');
	});

	it('the delay grows, expires when waited out, and is forgotten after a quiet spell', async () => {
		const email = `schedule-${randomUUID()}@gloaming.test`;
		const client = newClient();
		const t0 = Date.parse('2031-10-31T18:00:00Z');
		const at = (s: number) => new Date(t0 + s * 1000);
		for (let i = 0; i < FREE; i++)
			expect((await takeSignInTry(db, 'password', email, client, at(0))).ok).toBe(true);
		const refused = await takeSignInTry(db, 'password', email, client, at(0));
		expect(refused).toEqual({
			ok: false,
			waitSeconds: 2,
			message: 'Too many tries. Try again in 2 seconds, or ask for a sign-in link by e-mail.'
		});
		// Refused tries do not add to the wait.
		expect(await takeSignInTry(db, 'password', email, client, at(1))).toMatchObject({
			ok: false,
			waitSeconds: 1
		});
		expect((await takeSignInTry(db, 'password', email, client, at(2))).ok).toBe(true);
		expect(await takeSignInTry(db, 'password', email, client, at(2))).toMatchObject({
			waitSeconds: 4
		});
		expect((await takeSignInTry(db, 'password', email, client, at(6))).ok).toBe(true);
		expect(await takeSignInTry(db, 'password', email, client, at(6))).toMatchObject({
			waitSeconds: 8
		});
		// An hour and a bit without tries: the count starts again, five free tries.
		const later = 6 + SIGN_IN_LIMITS.password.person.forgetAfter + 1;
		for (let i = 0; i < FREE; i++)
			expect((await takeSignInTry(db, 'password', email, client, at(later))).ok).toBe(true);
		expect((await takeSignInTry(db, 'password', email, client, at(later))).ok).toBe(false);
	});
});

describe('sign-in limits through the real handlers', () => {
	it('30 wrong passwords at once get exactly the free tries, the rest are told to wait', async () => {
		const email = await personWithPassword();
		const attacker = new Browser(newClient());
		const replies = await Promise.all(
			Array.from({ length: 30 }, (_, i) => tryPassword(attacker, email, `guess-${i}`))
		);
		const checked = replies.filter((r) => r.status === 400);
		const refused = replies.filter((r) => r.status === 429);
		expect(checked).toHaveLength(FREE);
		expect(refused).toHaveLength(30 - FREE);
		expect(refused[0].data!.message).toMatch(
			/^Too many tries\. Try again in \d+ seconds?, or ask for a sign-in link by e-mail\.$/
		);
		expect((await limitRow('password:person', email)).tries).toBe(FREE);
	});

	it('one client trying many addresses is slowed down too', async () => {
		const sprayer = new Browser(newClient());
		const free = SIGN_IN_LIMITS.password.client.free;
		for (let i = 0; i < free; i++) {
			const res = await tryPassword(sprayer, `spray-${randomUUID()}@gloaming.test`, 'wrong');
			expect(res.status).toBe(400);
		}
		const limited = await tryPassword(sprayer, `spray-${randomUUID()}@gloaming.test`, 'wrong');
		expect(limited.status).toBe(429);
		// Another client is not held up by it.
		const other = await tryPassword(new Browser(newClient()), await personWithPassword(), PASSWORD);
		expect(other.status).toBe(302);
	});

	it("Auth.js's own password route takes tries from the same limiter as the form", async () => {
		const email = await personWithPassword();
		const script = new Browser(newClient());
		const viaLibrary = () =>
			script.postAuth('/auth/callback/credentials', { email, password: 'wrong' });
		for (let i = 0; i < 2; i++)
			expect((await tryPassword(script, email, 'wrong')).status).toBe(400);
		for (let i = 2; i < FREE; i++) {
			const res = await viaLibrary();
			expect(res.status).toBe(302);
			expect(res.location).toContain('error=CredentialsSignin');
		}
		const limited = await viaLibrary();
		expect(limited.status).toBe(429);
		expect(limited.text).toMatch(/^Too many tries\. Try again in \d+ seconds?/);
		// Even the right password waits: nothing past the limiter checks it.
		expect(
			(await script.postAuth('/auth/callback/credentials', { email, password: PASSWORD })).status
		).toBe(429);
		expect(await script.person()).toBeNull();
		// A JSON body is read the same way.
		const json = await script.fetch('/auth/callback/credentials', {
			method: 'POST',
			headers: { 'content-type': 'application/json' },
			body: JSON.stringify({ email: email.toUpperCase(), password: 'wrong' })
		});
		expect(json.status).toBe(429);
	});

	it("Auth.js's link route is limited per address, and other library posts are refused", async () => {
		const email = `links-${randomUUID()}@gloaming.test`;
		const script = new Browser(newClient());
		const free = SIGN_IN_LIMITS.link.person.free;
		for (let i = 0; i < free; i++)
			expect((await script.postAuth('/auth/signin/nodemailer', { email })).status).toBe(302);
		const limited = await script.postAuth('/auth/signin/nodemailer', { email });
		expect(limited.status).toBe(429);
		expect(limited.text).toBe('Too many tries. Try again in 60 seconds.');
		// The form counts against the same address.
		const viaForm = await script.action(signInPage.actions.link as never, '/sign-in?/link', {
			email,
			redirectTo: '/venues'
		});
		expect(viaForm.status).toBe(429);
		const tokens = await db
			.select()
			.from(verificationTokens)
			.where(eq(verificationTokens.identifier, email));
		expect(tokens).toHaveLength(free);

		for (const path of ['/auth/signin/credentials', '/auth/session', '/auth/callback/x/y']) {
			expect((await script.postAuth(path, { email })).status).toBe(404);
		}
		expect(authPost('/auth//callback//credentials')).toBe('password');
		expect(authPost('/auth/signout')).toBe('sign-out');
	});

	it('the password form cannot be turned into a link sender', async () => {
		const email = await personWithPassword();
		const browser = new Browser(newClient());
		const res = await browser.action(signInPage.actions.password as never, '/sign-in?/password', {
			providerId: 'nodemailer',
			email,
			password: 'wrong'
		});
		expect(res.status).toBe(400);
		const tokens = await db
			.select()
			.from(verificationTokens)
			.where(eq(verificationTokens.identifier, email));
		expect(tokens).toHaveLength(0);
	});

	it('while passwords are guessed, the e-mailed link still signs the real person in', async () => {
		const email = await personWithPassword();
		const attacker = new Browser(newClient());
		await Promise.all(
			Array.from({ length: 10 }, (_, i) => tryPassword(attacker, email, `guess-${i}`))
		);
		expect((await tryPassword(attacker, email, 'again')).status).toBe(429);

		const person = new Browser(newClient());
		// Their password waits too (it is their address being guessed)…
		expect((await tryPassword(person, email, PASSWORD)).status).toBe(429);
		// …but a link goes out and works.
		const asked = await person.action(signInPage.actions.link as never, '/sign-in?/link', {
			email,
			redirectTo: '/venues'
		});
		expect(asked.status).toBe(302);
		const mail = await mailTo(email);
		const link = new URL(mail.text.match(/https?:\/\/\S*\/auth\/callback\/nodemailer\S*/)![0]);
		const visit = await person.fetch(link.pathname + link.search);
		expect(visit.status).toBe(302);
		expect((await person.person())?.email).toBe(email);
	});

	it('once the wait is over a try goes through, and signing in starts the count again', async () => {
		const email = await personWithPassword();
		const browser = new Browser(newClient());
		for (let i = 0; i < FREE; i++) await tryPassword(browser, email, 'wrong');
		expect((await tryPassword(browser, email, PASSWORD)).status).toBe(429);
		// Let the wait run out (moving it into the past stands in for waiting two seconds).
		await db
			.update(signInLimits)
			.set({ openAt: new Date(Date.now() - 1000) })
			.where(eq(signInLimits.key, email));
		const signedIn = await tryPassword(browser, email, PASSWORD);
		expect(signedIn.status).toBe(302);
		expect((await browser.person())?.email).toBe(email);
		expect(await limitRow('password:person', email)).toBeUndefined();
	});
});
