import { asc, eq } from 'drizzle-orm';
import type { Db } from '../db/client';
import { memberships, venues } from '../db/schema';

/** Every venue the person belongs to, with their role there. */
export function venuesOf(db: Db, personId: string) {
	return db
		.select({
			id: venues.id,
			slug: venues.slug,
			name: venues.name,
			kind: venues.kind,
			timeZone: venues.timeZone,
			role: memberships.role
		})
		.from(memberships)
		.innerJoin(venues, eq(venues.id, memberships.venueId))
		.where(eq(memberships.personId, personId))
		.orderBy(asc(venues.name));
}
