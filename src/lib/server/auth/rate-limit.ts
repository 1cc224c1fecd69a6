import { and, count, eq, gte } from 'drizzle-orm';
import type { Db } from '../db/client';
import { signInAttempts } from '../db/schema';

export const RATE_LIMITS = {
	windowMinutes: 15,
	password: { perEmail: 5, perAddress: 20 },
	'email-link': { perEmail: 5, perAddress: 20 }
} as const;

type Method = 'password' | 'email-link';

/**
 * Whether another attempt is allowed. Password attempts count failures; e-mail links count every
 * request, since each one sends a message. The window lives in PostgreSQL so every app server agrees.
 */
export async function checkSignInAllowed(
	db: Db,
	method: Method,
	email: string,
	address: string,
	now = new Date()
): Promise<{ allowed: true } | { allowed: false; message: string }> {
	const since = new Date(now.getTime() - RATE_LIMITS.windowMinutes * 60_000);
	const limits = RATE_LIMITS[method];
	const countFor = async (keyKind: 'email' | 'address', key: string) => {
		const conditions = [
			eq(signInAttempts.keyKind, keyKind),
			eq(signInAttempts.key, key),
			eq(signInAttempts.method, method),
			gte(signInAttempts.at, since)
		];
		if (method === 'password') conditions.push(eq(signInAttempts.succeeded, false));
		const [row] = await db
			.select({ n: count() })
			.from(signInAttempts)
			.where(and(...conditions));
		return row.n;
	};
	const what = method === 'password' ? 'sign-in attempts' : 'sign-in links';
	if ((await countFor('email', email)) >= limits.perEmail) {
		return {
			allowed: false,
			message: `Too many ${what} for ${email}. Wait ${RATE_LIMITS.windowMinutes} minutes and try again.`
		};
	}
	if ((await countFor('address', address)) >= limits.perAddress) {
		return {
			allowed: false,
			message: `Too many ${what} from this network. Wait ${RATE_LIMITS.windowMinutes} minutes and try again.`
		};
	}
	return { allowed: true };
}

export async function recordSignInAttempt(
	db: Db,
	method: Method,
	email: string,
	address: string,
	succeeded: boolean
) {
	await db.insert(signInAttempts).values([
		{ keyKind: 'email', key: email, method, succeeded },
		{ keyKind: 'address', key: address, method, succeeded }
	]);
}
