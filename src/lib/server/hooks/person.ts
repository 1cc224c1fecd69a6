import type { Handle } from '@sveltejs/kit';
import { db } from '../db';
import { config } from '../config';
import { isUnstorable } from '../text';
import type { VenueContext } from '../auth/types';
import {
	findSession,
	findSessionAndVenue,
	renewSession,
	renewalDue,
	sessionCookieName,
	sessionCookieOptions
} from '../auth/sessions';

/**
 * Resolve the session once into locals.person (whitelisted fields only, never tokens): one indexed
 * query on the session cookie, no decryption and no cookie set, except once a day when a session
 * in use has its idle end pushed back. Under a [venue] route the same query reads the person's
 * membership of that venue into locals.venue (the venue hook then has nothing left to do).
 */
export const personHandle: Handle = async ({ event, resolve }) => {
	event.locals.person = null;
	event.locals.venueResolved = false;
	const secure = config.production;
	const name = sessionCookieName(secure);
	const token = event.cookies.get(name);
	const slug = event.params.venue;
	const withVenue = slug && !isUnstorable(slug);
	const found = withVenue
		? await findSessionAndVenue(db, token, slug)
		: await findSession(db, token);
	if (found && token) {
		event.locals.person = found.person;
		if (withVenue) {
			event.locals.venue = 'venue' in found ? (found.venue as VenueContext | null) : null;
			event.locals.venueResolved = true;
		}
		if (renewalDue(found.expires)) {
			const expires = await renewSession(db, token);
			event.cookies.set(name, token, { ...sessionCookieOptions(secure), expires });
		}
	}
	return resolve(event);
};
