import { fail, redirect } from '@sveltejs/kit';
import { eq } from 'drizzle-orm';
import { requirePerson } from '$lib/server/auth/guard';
import { audit } from '$lib/server/audit';
import { db } from '$lib/server/db';
import { memberships, venues } from '$lib/server/db/schema';
import { keep, parseForm } from '$lib/server/forms';
import { newVenueSchema } from '$lib/schemas/venue';
import { slugify } from '$lib/util/slug';
import type { Actions, PageServerLoad } from './$types';

// The list itself comes from the (app) layout.
export const load: PageServerLoad = (event) => {
	requirePerson(event);
	return {};
};

export const actions: Actions = {
	create: async (event) => {
		const person = requirePerson(event);
		const parsed = await parseForm(event.request, newVenueSchema);
		if (!parsed.ok) return fail(400, { values: keep(parsed.raw), errors: parsed.errors });
		const base = slugify(parsed.data.name) || 'venue';
		let slug = base;
		for (
			let i = 2;
			(await db.select({ id: venues.id }).from(venues).where(eq(venues.slug, slug))).length;
			i++
		) {
			slug = `${base}-${i}`;
		}
		await db.transaction(async (tx) => {
			const [venue] = await tx
				.insert(venues)
				.values({ ...parsed.data, slug })
				.returning();
			await tx
				.insert(memberships)
				.values({ venueId: venue.id, personId: person.id, role: 'owner' });
			await audit(tx, {
				venueId: venue.id,
				personId: person.id,
				action: 'venue.created',
				detail: { name: venue.name }
			});
		});
		redirect(303, `/v/${slug}`);
	}
};
