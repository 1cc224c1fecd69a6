import { createHash, randomBytes } from 'node:crypto';
import { and, eq, gt, lt } from 'drizzle-orm';
import type { Db } from '../db/client';
import { memberships, sessions, users, venues } from '../db/schema';
import type { SessionPerson, VenueContext } from './types';

/**
 * Sessions live in PostgreSQL, one row per signed-in browser, so they can be ended: signing out
 * ends that browser's, and a password change (a trigger on users), removal from one's last venue
 * or the account going ends all of a person's. The cookie holds only a random token; the row keeps
 * its SHA-256, so the table alone signs nobody in.
 *
 * A session ends after SESSION_IDLE_DAYS without use. Using it pushes the end back, but at most
 * once a day, so an ordinary request costs one indexed read and sets no cookie.
 */
export const SESSION_IDLE_DAYS = 14;
const IDLE_MS = SESSION_IDLE_DAYS * 24 * 60 * 60 * 1000;
const RENEW_EVERY_MS = 24 * 60 * 60 * 1000;

/** Auth.js's own name for its session cookie, kept so its routes find the same cookie. */
export function sessionCookieName(secure: boolean) {
	return `${secure ? '__Secure-' : ''}authjs.session-token`;
}

export function sessionCookieOptions(secure: boolean) {
	return { httpOnly: true, sameSite: 'lax' as const, path: '/', secure };
}

const hashOf = (token: string) => createHash('sha256').update(token).digest('hex');

/** Tokens we issue are 43 characters; anything far longer is not worth a query. */
const plausible = (token: string | undefined): token is string =>
	!!token && token.length >= 20 && token.length <= 100;

/** A new session for the person; returns the token for the cookie. */
export async function startSession(db: Db, personId: string, now = new Date()) {
	const token = randomBytes(32).toString('base64url');
	await db.transaction(async (tx) => {
		// Their sessions that ended on their own go now, so rows never pile up.
		await tx.delete(sessions).where(and(eq(sessions.userId, personId), lt(sessions.expires, now)));
		await tx.insert(sessions).values({
			sessionToken: hashOf(token),
			userId: personId,
			expires: new Date(now.getTime() + IDLE_MS)
		});
	});
	return token;
}

/** The person behind a session token, in one query; null when it ended or never was. */
export async function findSession(
	db: Db,
	token: string | undefined,
	now = new Date()
): Promise<{ person: SessionPerson; expires: Date } | null> {
	if (!plausible(token)) return null;
	const [row] = await db
		.select({ id: users.id, name: users.name, email: users.email, expires: sessions.expires })
		.from(sessions)
		.innerJoin(users, eq(users.id, sessions.userId))
		.where(and(eq(sessions.sessionToken, hashOf(token)), gt(sessions.expires, now)))
		.limit(1);
	if (!row) return null;
	const { expires, ...person } = row;
	return { person, expires };
}

/**
 * The person behind a session token and, for a route under a venue, their membership in it, in one
 * indexed query (the session's hash, the venue's slug, the membership's venue and person). venue is
 * null when there is no such venue or the person is not a member of it.
 */
export async function findSessionAndVenue(
	db: Db,
	token: string | undefined,
	slug: string,
	now = new Date()
): Promise<{ person: SessionPerson; expires: Date; venue: VenueContext | null } | null> {
	if (!plausible(token)) return null;
	const [row] = await db
		.select({
			id: users.id,
			name: users.name,
			email: users.email,
			expires: sessions.expires,
			venueId: venues.id,
			slug: venues.slug,
			venueName: venues.name,
			kind: venues.kind,
			timeZone: venues.timeZone,
			clock: venues.clock,
			role: memberships.role
		})
		.from(sessions)
		.innerJoin(users, eq(users.id, sessions.userId))
		.leftJoin(venues, eq(venues.slug, slug))
		.leftJoin(
			memberships,
			and(eq(memberships.venueId, venues.id), eq(memberships.personId, users.id))
		)
		.where(and(eq(sessions.sessionToken, hashOf(token)), gt(sessions.expires, now)))
		.limit(1);
	if (!row) return null;
	const { id, name, email, expires, venueId, venueName, kind, timeZone, clock, role } = row;
	const venue =
		venueId && role && kind && timeZone && clock && venueName
			? { id: venueId, slug: row.slug!, name: venueName, kind, timeZone, clock, role }
			: null;
	return { person: { id, name, email }, expires, venue };
}

/** When a session in use should have its end pushed back: once a day at most. */
export function renewalDue(expires: Date, now = new Date()) {
	return expires.getTime() - now.getTime() < IDLE_MS - RENEW_EVERY_MS;
}

/** Push a session's end back to SESSION_IDLE_DAYS from now; returns the new end. */
export async function renewSession(db: Db, token: string, now = new Date()) {
	const expires = new Date(now.getTime() + IDLE_MS);
	await db
		.update(sessions)
		.set({ expires })
		.where(and(eq(sessions.sessionToken, hashOf(token)), gt(sessions.expires, now)));
	return expires;
}

/** End one session (signing out). */
export async function endSession(db: Pick<Db, 'delete'>, token: string | undefined) {
	if (!plausible(token)) return;
	await db.delete(sessions).where(eq(sessions.sessionToken, hashOf(token)));
}

/** End every session of a person, on every device. */
export async function endSessionsOf(db: Pick<Db, 'delete'>, personId: string) {
	await db.delete(sessions).where(eq(sessions.userId, personId));
}
