import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { randomUUID } from 'node:crypto';
import type { ChildProcess } from 'node:child_process';
import { Browser } from './browser';
import { caught, catcherSmtpPort, startCatcher, stopCatcher } from './catcher';
import { useTestEnv } from './routes';

// Sign-in links carry a valid token, so they must point at the configured public address whatever
// host the request claims. The mail goes through the local mail catcher, as in production.
vi.mock('$env/dynamic/private', () => ({ env: process.env }));
useTestEnv();
const ORIGIN = 'https://gloaming.example.org';
process.env.ORIGIN = ORIGIN;
process.env.AUTH_SECRET = 'test-secret-for-sign-in-links-0123456789';
process.env.SMTP_HOST = '127.0.0.1';
process.env.SMTP_PORT = String(catcherSmtpPort);
const signInPage = await import('../../src/routes/(auth)/sign-in/+page.server');
const { checkConfig } = await import('../../src/lib/server/config');

const evil = {
	'x-forwarded-host': 'evil.example',
	'x-forwarded-proto': 'http',
	host: 'evil.example'
};

let catcher: ChildProcess;
beforeAll(async () => {
	catcher = await startCatcher();
}, 30_000);
afterAll(async () => {
	await stopCatcher(catcher);
});

async function mailTo(email: string) {
	for (let i = 0; i < 50; i++) {
		const [mail] = await caught(email);
		if (mail) return mail;
		await new Promise((r) => setTimeout(r, 100));
	}
	throw new Error(`no mail reached ${email}`);
}

function linksIn(text: string) {
	return text.match(/https?:\/\/[^\s<>"]+/g) ?? [];
}

describe('sign-in links', () => {
	it('the sign-in form sends a link on ORIGIN even with a forwarded host', async () => {
		const email = `link-${randomUUID()}@gloaming.test`;
		const browser = new Browser('10.20.0.1', evil);
		const res = await browser.action(signInPage.actions.link as never, '/sign-in?/link', {
			providerId: 'nodemailer',
			email,
			redirectTo: '/venues'
		});
		expect(res.status).toBe(302);
		expect(new URL(res.location!).origin).toBe(ORIGIN);
		const mail = await mailTo(email);
		const links = linksIn(mail.text);
		expect(links.length).toBeGreaterThan(0);
		for (const link of links) expect(new URL(link).origin).toBe(ORIGIN);
		expect(mail.text + (mail.html ?? '')).not.toContain('evil.example');

		// Following the link signs the person in and lands on this site.
		const opened = new URL(links.find((l) => l.includes('/auth/callback/nodemailer'))!);
		const visit = await browser.fetch(opened.pathname + opened.search);
		expect(visit.status).toBe(302);
		expect(visit.location).toBe(`${ORIGIN}/venues`);
		expect((await browser.person())?.email).toBe(email);
	});

	it('a direct post to the library route also builds the link on ORIGIN', async () => {
		const email = `direct-${randomUUID()}@gloaming.test`;
		const browser = new Browser('10.20.0.2', evil);
		const res = await browser.postAuth('/auth/signin/nodemailer', {
			email,
			callbackUrl: 'http://evil.example/steal'
		});
		expect(res.status).toBe(302);
		const mail = await mailTo(email);
		for (const link of linksIn(mail.text)) expect(new URL(link).origin).toBe(ORIGIN);
		expect(mail.text + (mail.html ?? '')).not.toContain('evil.example');
	});

	it('a built server refuses to start without ORIGIN, saying why', () => {
		delete process.env.ORIGIN;
		try {
			expect(() => checkConfig(true)).toThrow(/ORIGIN is not set/);
			process.env.ORIGIN = 'https://gloaming.example.org/app';
			expect(() => checkConfig(true)).toThrow(/ORIGIN must be just the public address/);
			process.env.ORIGIN = ORIGIN;
			expect(() => checkConfig(true)).not.toThrow();
		} finally {
			process.env.ORIGIN = ORIGIN;
		}
	});
});
