import type { Handle } from '@sveltejs/kit';
import { and, eq } from 'drizzle-orm';
import { db } from '../db';
import { memberships, venues } from '../db/schema';
import { isUnstorable } from '../text';

/** For routes with a [venue] parameter, load the venue and the person's membership in it. */
export const venueHandle: Handle = async ({ event, resolve }) => {
	if (event.locals.venueResolved) return resolve(event);
	event.locals.venue = null;
	const slug = event.params.venue;
	if (slug && event.locals.person && !isUnstorable(slug)) {
		const [row] = await db
			.select({
				id: venues.id,
				slug: venues.slug,
				name: venues.name,
				kind: venues.kind,
				timeZone: venues.timeZone,
				clock: venues.clock,
				role: memberships.role
			})
			.from(venues)
			.innerJoin(
				memberships,
				and(eq(memberships.venueId, venues.id), eq(memberships.personId, event.locals.person.id))
			)
			.where(eq(venues.slug, slug))
			.limit(1);
		event.locals.venue = row ?? null;
	}
	return resolve(event);
};
