import { afterAll, inject } from 'vitest';
import { randomUUID } from 'node:crypto';
import { createDb } from '../../src/lib/server/db/client';
import { memberships, users, venues } from '../../src/lib/server/db/schema';
import type { Role } from '../../src/lib/roles';

/** A database client for one test file, closed when the file ends. */
export function testDb() {
	const client = createDb(inject('databaseUrl'), { max: 4 });
	afterAll(() => client.sql.end());
	return client.db;
}

type Db = ReturnType<typeof testDb>;

export async function makePerson(db: Db, name = 'Test Person') {
	const [p] = await db
		.insert(users)
		.values({ email: `${randomUUID()}@gloaming.test`, name })
		.returning();
	return p;
}

export async function makeVenue(db: Db, members: [string, Role][] = []) {
	const slug = `venue-${randomUUID().slice(0, 8)}`;
	const [v] = await db
		.insert(venues)
		.values({ name: `Test ${slug}`, slug, kind: 'haunt', timeZone: 'Europe/London' })
		.returning();
	const ms = [];
	for (const [personId, role] of members) {
		const [m] = await db.insert(memberships).values({ venueId: v.id, personId, role }).returning();
		ms.push(m);
	}
	return { venue: v, memberships: ms };
}
