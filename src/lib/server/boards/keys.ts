import { createHash, randomBytes } from 'node:crypto';
import { and, desc, eq, isNull, lt, or, sql } from 'drizzle-orm';
import type { Db } from '$lib/server/db/client';
import { boardKeys, controllers } from '$lib/server/db/schema';

// Board keys: a random 32-byte token, shown once; only its SHA-256 is stored. A key writes readings
// for its own controller's sensors and reads nothing.

const PREFIX = 'glb_';

export function hashToken(token: string): string {
	return createHash('sha256').update(token).digest('hex');
}

/** A new key for a controller of the venue; null when the controller is not the venue's. */
export async function issueKey(db: Db, venueId: string, controllerId: string, personId: string) {
	const [c] = await db
		.select({ id: controllers.id, name: controllers.name })
		.from(controllers)
		.where(and(eq(controllers.id, controllerId), eq(controllers.venueId, venueId)));
	if (!c) return null;
	const token = PREFIX + randomBytes(32).toString('base64url');
	const [key] = await db
		.insert(boardKeys)
		.values({
			venueId,
			controllerId,
			tokenHash: hashToken(token),
			hint: token.slice(0, PREFIX.length + 6),
			createdBy: personId
		})
		.returning({ id: boardKeys.id, hint: boardKeys.hint });
	return { ...key, token, controller: c };
}

/** Revokes a key of the venue; false when there is no such key still in force. */
export async function revokeKey(db: Db, venueId: string, keyId: string) {
	const done = await db
		.update(boardKeys)
		.set({ revokedAt: new Date() })
		.where(
			and(eq(boardKeys.id, keyId), eq(boardKeys.venueId, venueId), isNull(boardKeys.revokedAt))
		)
		.returning({ id: boardKeys.id, controllerId: boardKeys.controllerId });
	return done[0] ?? null;
}

export async function venueKeys(db: Db, venueId: string) {
	return db
		.select({
			id: boardKeys.id,
			controllerId: boardKeys.controllerId,
			hint: boardKeys.hint,
			createdAt: boardKeys.createdAt,
			lastUsedAt: boardKeys.lastUsedAt,
			revokedAt: boardKeys.revokedAt
		})
		.from(boardKeys)
		.where(eq(boardKeys.venueId, venueId))
		.orderBy(desc(boardKeys.createdAt));
}

export interface BoardKey {
	id: string;
	venueId: string;
	controllerId: string;
}

/** The key in force for a token, or null. Marks it used (at most once a minute, to spare writes). */
export async function keyForToken(
	db: Db,
	token: string,
	now = new Date()
): Promise<BoardKey | null> {
	if (!token.startsWith(PREFIX) || token.length > 100) return null;
	const [k] = await db
		.select({
			id: boardKeys.id,
			venueId: boardKeys.venueId,
			controllerId: boardKeys.controllerId
		})
		.from(boardKeys)
		.where(and(eq(boardKeys.tokenHash, hashToken(token)), isNull(boardKeys.revokedAt)));
	if (!k) return null;
	await db
		.update(boardKeys)
		.set({ lastUsedAt: now })
		.where(
			and(
				eq(boardKeys.id, k.id),
				or(
					isNull(boardKeys.lastUsedAt),
					lt(boardKeys.lastUsedAt, sql`${now.toISOString()}::timestamptz - interval '1 minute'`)
				)
			)
		);
	return k;
}
