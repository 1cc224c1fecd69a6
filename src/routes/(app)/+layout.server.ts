import { requirePerson } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { venuesOf } from '$lib/server/venues/queries';
import type { LayoutServerLoad } from './$types';

export const load: LayoutServerLoad = async (event) => {
	const person = requirePerson(event);
	return { myVenues: await venuesOf(db, person.id) };
};
