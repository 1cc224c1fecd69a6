import { json } from '@sveltejs/kit';
import { requirePerson } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { keepListFor } from '$lib/server/checklists/offline';
import type { RequestHandler } from './$types';

/** The pages and data the signed-in person's phone keeps for use without signal. */
export const GET: RequestHandler = async (event) => {
	const person = requirePerson(event);
	return json(await keepListFor(db, person.id), { headers: { 'cache-control': 'no-store' } });
};
