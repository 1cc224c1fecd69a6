import type { Handle } from '@sveltejs/kit';
import { eq } from 'drizzle-orm';
import { db } from '../db';
import { users } from '../db/schema';

/** Resolve the session once into locals.person: whitelisted fields only, never tokens. */
export const personHandle: Handle = async ({ event, resolve }) => {
	event.locals.person = null;
	const session = await event.locals.auth();
	const id = session?.user?.id;
	if (id) {
		const [row] = await db
			.select({ id: users.id, name: users.name, email: users.email })
			.from(users)
			.where(eq(users.id, id))
			.limit(1);
		event.locals.person = row ?? null;
	}
	return resolve(event);
};
