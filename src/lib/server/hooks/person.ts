import type { Handle } from '@sveltejs/kit';
import { db } from '../db';
import { config } from '../config';
import {
	findSession,
	renewSession,
	renewalDue,
	sessionCookieName,
	sessionCookieOptions
} from '../auth/sessions';

/**
 * Resolve the session once into locals.person (whitelisted fields only, never tokens): one indexed
 * query on the session cookie, no decryption and no cookie set, except once a day when a session
 * in use has its idle end pushed back.
 */
export const personHandle: Handle = async ({ event, resolve }) => {
	event.locals.person = null;
	const secure = config.production;
	const name = sessionCookieName(secure);
	const token = event.cookies.get(name);
	const found = await findSession(db, token);
	if (found && token) {
		event.locals.person = found.person;
		if (renewalDue(found.expires)) {
			const expires = await renewSession(db, token);
			event.cookies.set(name, token, { ...sessionCookieOptions(secure), expires });
		}
	}
	return resolve(event);
};
