import { json } from '@sveltejs/kit';
import { eq } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { venues } from '$lib/server/db/schema';
import type { RequestHandler } from './$types';

/** No venue has this id: the look-up below finds nothing but still goes through the index. */
const NOBODY = '00000000-0000-0000-0000-000000000000';

// Public: a load balancer's health check, and the floor of `npm run bench` (one indexed
// primary-key query through the app's own database client, nothing else).
export const GET: RequestHandler = async () => {
	await db.select({ id: venues.id }).from(venues).where(eq(venues.id, NOBODY)).limit(1);
	return json({ ok: true }, { headers: { 'cache-control': 'no-store' } });
};
