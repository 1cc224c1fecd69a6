import { fail, redirect } from '@sveltejs/kit';
import { requirePerson } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { keep, parseForm } from '$lib/server/forms';
import {
	NOT_ALLOWED_TO_CREATE,
	VenueNotAllowed,
	createVenue,
	mayCreateVenue
} from '$lib/server/venues/create';
import { newVenueSchema } from '$lib/schemas/venue';
import type { Actions, PageServerLoad } from './$types';

// The list itself comes from the (app) layout.
export const load: PageServerLoad = async (event) => {
	const person = requirePerson(event);
	const canCreate = await mayCreateVenue(db, person.id);
	return { canCreate, notAllowed: canCreate ? null : NOT_ALLOWED_TO_CREATE };
};

export const actions: Actions = {
	create: async (event) => {
		const person = requirePerson(event);
		const parsed = await parseForm(event.request, newVenueSchema);
		if (!parsed.ok) return fail(400, { values: keep(parsed.raw), errors: parsed.errors });
		let slug: string;
		try {
			slug = await createVenue(db, person.id, parsed.data);
		} catch (e) {
			if (e instanceof VenueNotAllowed)
				return fail(403, { values: keep(parsed.raw), message: e.message });
			throw e;
		}
		redirect(303, `/v/${slug}`);
	}
};
