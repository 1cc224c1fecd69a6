import { describe, expect, it } from 'vitest';
import { randomUUID } from 'node:crypto';
import {
	RATE_LIMITS,
	checkSignInAllowed,
	recordSignInAttempt
} from '../../src/lib/server/auth/rate-limit';
import { testDb } from './db';

const db = testDb();

describe('sign-in rate limits', () => {
	it('blocks an e-mail address after its failed password attempts, with a clear message', async () => {
		const email = `${randomUUID()}@gloaming.test`;
		const address = `10.9.${Math.floor(Math.random() * 250)}.1`;
		for (let i = 0; i < RATE_LIMITS.password.perEmail; i++) {
			expect((await checkSignInAllowed(db, 'password', email, address)).allowed).toBe(true);
			await recordSignInAttempt(db, 'password', email, address, false);
		}
		const verdict = await checkSignInAllowed(db, 'password', email, address);
		expect(verdict).toEqual({
			allowed: false,
			message: expect.stringContaining(`Too many sign-in attempts for ${email}`)
		});
	});

	it('successful password sign-ins do not count against the limit', async () => {
		const email = `${randomUUID()}@gloaming.test`;
		for (let i = 0; i < RATE_LIMITS.password.perEmail + 2; i++) {
			await recordSignInAttempt(db, 'password', email, 'addr-ok', true);
		}
		expect((await checkSignInAllowed(db, 'password', email, 'addr-ok')).allowed).toBe(true);
	});

	it('blocks a client address trying many e-mail addresses', async () => {
		const address = `addr-${randomUUID()}`;
		for (let i = 0; i < RATE_LIMITS.password.perAddress; i++) {
			await recordSignInAttempt(db, 'password', `${randomUUID()}@gloaming.test`, address, false);
		}
		const verdict = await checkSignInAllowed(db, 'password', 'fresh@gloaming.test', address);
		expect(verdict.allowed).toBe(false);
		if (!verdict.allowed) expect(verdict.message).toMatch(/from this network/);
	});

	it('attempts older than the window are forgotten', async () => {
		const email = `${randomUUID()}@gloaming.test`;
		for (let i = 0; i < RATE_LIMITS.password.perEmail; i++) {
			await recordSignInAttempt(db, 'password', email, 'addr-old', false);
		}
		const later = new Date(Date.now() + (RATE_LIMITS.windowMinutes + 1) * 60_000);
		expect((await checkSignInAllowed(db, 'password', email, 'addr-old', later)).allowed).toBe(true);
	});
});
