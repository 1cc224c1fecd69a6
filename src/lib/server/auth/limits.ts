import { and, eq, lt, sql } from 'drizzle-orm';
import type { Db } from '../db/client';
import { signInLimits } from '../db/schema';

/**
 * The one sign-in limiter. Every way in asks it first: the sign-in page's forms and Auth.js's own
 * routes under /auth (see src/auth.ts). It slows down rather than locks out: each address and
 * each client gets a few free tries, after which every try waits longer than the one before
 * (doubling up to a ceiling), and a quiet spell forgets the count. Passwords and e-mailed links
 * are counted apart, so someone guessing a person's password never stops that person's link.
 *
 * A try is taken in one transaction that locks the rows it counts against (always the client's
 * first, then the person's, so two tries never wait on each other in a circle): parallel tries
 * queue on those rows, and no more get through than the rules allow.
 */
export type SignInWay = 'password' | 'link';

export interface LimitRule {
	/** Tries let through before any wait. */
	free: number;
	/** Seconds to wait after the last free try; doubles with every try after it. */
	firstWait: number;
	/** The longest wait, in seconds. */
	longestWait: number;
	/** Seconds without a try after which the count starts again. */
	forgetAfter: number;
}

export const SIGN_IN_LIMITS: Record<SignInWay, { person: LimitRule; client: LimitRule }> = {
	password: {
		person: { free: 5, firstWait: 2, longestWait: 10 * 60, forgetAfter: 60 * 60 },
		client: { free: 20, firstWait: 1, longestWait: 10 * 60, forgetAfter: 60 * 60 }
	},
	// Each try sends an e-mail: after 3, one an hour at most per address.
	link: {
		person: { free: 3, firstWait: 60, longestWait: 60 * 60, forgetAfter: 24 * 60 * 60 },
		client: { free: 10, firstWait: 10, longestWait: 60 * 60, forgetAfter: 24 * 60 * 60 }
	}
};

/** Seconds the next try waits after the `tries`-th one. */
export function waitAfter(tries: number, rule: LimitRule): number {
	if (tries < rule.free) return 0;
	return Math.min(rule.longestWait, rule.firstWait * 2 ** (tries - rule.free));
}

/** "8 seconds", "1 minute", "12 minutes": a wait in the words people use. */
export function waitWords(seconds: number): string {
	const s = Math.max(1, Math.ceil(seconds));
	if (s < 120) return `${s} ${s === 1 ? 'second' : 'seconds'}`;
	const m = Math.ceil(s / 60);
	return `${m} minutes`;
}

export type SignInTry = { ok: true } | { ok: false; waitSeconds: number; message: string };

type Scope = (typeof signInLimits.$inferSelect)['scope'];

function keysFor(way: SignInWay, email: string | null, client: string) {
	const rules = SIGN_IN_LIMITS[way];
	const keys: { scope: Scope; key: string; rule: LimitRule }[] = [
		{ scope: `${way}:client`, key: client, rule: rules.client }
	];
	if (email) keys.push({ scope: `${way}:person`, key: email, rule: rules.person });
	return keys;
}

export function tooManyMessage(way: SignInWay, waitSeconds: number) {
	const wait = waitWords(waitSeconds);
	return way === 'password'
		? `Too many tries. Try again in ${wait}, or ask for a sign-in link by e-mail.`
		: `Too many tries. Try again in ${wait}.`;
}

/**
 * Take one sign-in try for this address (when known) and client, or say how long to wait.
 * A refused try changes nothing, so waiting it out is always enough.
 */
export async function takeSignInTry(
	db: Db,
	way: SignInWay,
	email: string | null,
	client: string,
	now = new Date()
): Promise<SignInTry> {
	const keys = keysFor(way, email, client);
	const verdict = await db.transaction(async (tx) => {
		// Creates the rows when new and locks them either way, in the order given.
		const rows = await tx
			.insert(signInLimits)
			.values(keys.map(({ scope, key }) => ({ scope, key, lastTryAt: now, openAt: now })))
			.onConflictDoUpdate({
				target: [signInLimits.scope, signInLimits.key],
				set: { scope: sql`excluded.scope` }
			})
			.returning();
		const byScope = new Map(rows.map((r) => [r.scope, r]));
		let waitMs = 0;
		for (const { scope } of keys) {
			waitMs = Math.max(waitMs, byScope.get(scope)!.openAt.getTime() - now.getTime());
		}
		if (waitMs > 0) return { ok: false as const, waitSeconds: Math.ceil(waitMs / 1000) };
		for (const { scope, key, rule } of keys) {
			const row = byScope.get(scope)!;
			const quiet = now.getTime() - row.lastTryAt.getTime() > rule.forgetAfter * 1000;
			const tries = (quiet ? 0 : row.tries) + 1;
			await tx
				.update(signInLimits)
				.set({
					tries,
					lastTryAt: now,
					openAt: new Date(now.getTime() + waitAfter(tries, rule) * 1000)
				})
				.where(and(eq(signInLimits.scope, scope), eq(signInLimits.key, key)));
		}
		return { ok: true as const };
	});
	// Now and then, drop rows long quiet (the longest forget time is a day).
	if (Math.random() < 0.01) {
		await db
			.delete(signInLimits)
			.where(lt(signInLimits.lastTryAt, new Date(now.getTime() - 2 * 24 * 60 * 60 * 1000)));
	}
	if (verdict.ok) return verdict;
	return { ...verdict, message: tooManyMessage(way, verdict.waitSeconds) };
}

/**
 * A try that succeeded: the person's count starts again, and the client gets its try back, so
 * people signing in one after another from one office network never wait.
 */
export async function forgiveSignInTry(
	db: Db,
	way: SignInWay,
	email: string | null,
	client: string
) {
	await db.transaction(async (tx) => {
		await tx
			.update(signInLimits)
			.set({ tries: sql`greatest(${signInLimits.tries} - 1, 0)` })
			.where(and(eq(signInLimits.scope, `${way}:client`), eq(signInLimits.key, client)));
		if (email)
			await tx
				.delete(signInLimits)
				.where(and(eq(signInLimits.scope, `${way}:person`), eq(signInLimits.key, email)));
	});
}
