import { redirect } from '@sveltejs/kit';
import { requirePerson } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { venuesOf } from '$lib/server/venues/queries';
import type { PageServerLoad } from './$types';

// People with one venue land in it; others choose from their list.
export const load: PageServerLoad = async (event) => {
	const person = requirePerson(event);
	const mine = await venuesOf(db, person.id);
	redirect(303, mine.length === 1 ? `/v/${mine[0].slug}` : '/venues');
};
