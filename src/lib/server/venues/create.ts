import { eq, sql } from 'drizzle-orm';
import type { z } from 'zod';
import type { Db } from '../db/client';
import { memberships, venues } from '../db/schema';
import { audit } from '../audit';
import { config } from '../config';
import { slugify } from '$lib/util/slug';
import type { newVenueSchema } from '$lib/schemas/venue';

/**
 * Who may create a venue. On a fresh install (no venue yet) the first person signed in may; after
 * that only owners of an existing venue, so an account made by asking for a sign-in link does not
 * get a workspace of its own. GLOAMING_OPEN_VENUES=yes lets everyone create venues.
 */
export const NOT_ALLOWED_TO_CREATE =
	'Only owners of a venue can create another one here. To join a venue, ask its owner to invite ' +
	'you: they add your e-mail address on the venue’s Members page, and the e-mail you get lets you in.';

export async function mayCreateVenue(db: Pick<Db, 'execute'>, personId: string) {
	if (config.openVenues) return true;
	const [row] = await db.execute<{ any_venue: boolean; owns: boolean }>(sql`
		select exists (select 1 from ${venues}) as any_venue,
			exists (
				select 1 from ${memberships}
				where ${memberships.personId} = ${personId} and ${memberships.role} = 'owner'
			) as owns`);
	return !row.any_venue || row.owns;
}

export class VenueNotAllowed extends Error {
	constructor() {
		super(NOT_ALLOWED_TO_CREATE);
	}
}

/**
 * Create a venue with the person as its owner; returns its slug. The check and the creation
 * happen under one lock, so two people on a fresh install cannot both be "first".
 */
export async function createVenue(
	db: Db,
	personId: string,
	data: z.infer<typeof newVenueSchema>
): Promise<string> {
	const base = slugify(data.name) || 'venue';
	return db.transaction(async (tx) => {
		await tx.execute(sql`select pg_advisory_xact_lock(hashtext('venue-creation'))`);
		if (!(await mayCreateVenue(tx, personId))) throw new VenueNotAllowed();
		let slug = base;
		for (
			let i = 2;
			(await tx.select({ id: venues.id }).from(venues).where(eq(venues.slug, slug))).length;
			i++
		) {
			slug = `${base}-${i}`;
		}
		const [venue] = await tx
			.insert(venues)
			.values({ ...data, slug })
			.returning();
		await tx.insert(memberships).values({ venueId: venue.id, personId, role: 'owner' });
		await audit(tx, {
			venueId: venue.id,
			personId,
			action: 'venue.created',
			detail: { name: venue.name }
		});
		return slug;
	});
}
