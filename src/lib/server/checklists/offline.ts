import { and, eq, gt, sql } from 'drizzle-orm';
import type { Db } from '$lib/server/db/client';
import { assignments, memberships, shows, venues } from '$lib/server/db/schema';
import { KEEP_AHEAD_MS, type KeepList } from '$lib/offline/paths';

/**
 * What a person's phone keeps for use without signal: the venue list, each venue's Tonight page
 * (and My nights for crew), and the checklist page and checks of every show they are called for
 * in the next 36 hours (call before then, doors not yet closed). Only venues they still belong to.
 */
export async function keepListFor(db: Db, personId: string, now = new Date()): Promise<KeepList> {
	const theirs = await db
		.select({ slug: venues.slug, role: memberships.role })
		.from(memberships)
		.innerJoin(venues, eq(venues.id, memberships.venueId))
		.where(eq(memberships.personId, personId))
		.orderBy(venues.slug);
	const until = new Date(now.getTime() + KEEP_AHEAD_MS);
	const called = await db
		.selectDistinct({ slug: venues.slug, showId: shows.id, doorsOpen: shows.doorsOpen })
		.from(assignments)
		.innerJoin(shows, eq(shows.id, assignments.showId))
		.innerJoin(venues, eq(venues.id, shows.venueId))
		.innerJoin(
			memberships,
			and(eq(memberships.venueId, shows.venueId), eq(memberships.personId, personId))
		)
		.where(
			and(
				eq(assignments.personId, personId),
				eq(assignments.venueId, shows.venueId),
				eq(shows.status, 'scheduled'),
				gt(shows.doorsClose, now),
				sql`coalesce(${assignments.callOverride}, ${shows.crewCall}) < ${until.toISOString()}::timestamptz`
			)
		)
		.orderBy(shows.doorsOpen);
	const pages = ['/venues'];
	for (const v of theirs) {
		pages.push(`/v/${v.slug}`);
		if (v.role === 'crew') pages.push(`/v/${v.slug}/my-nights`);
	}
	const data: string[] = [];
	for (const c of called) {
		pages.push(`/v/${c.slug}/shows/${c.showId}/checklist`);
		data.push(`/api/v/${c.slug}/shows/${c.showId}/checks`);
	}
	return { personId, pages, data };
}
