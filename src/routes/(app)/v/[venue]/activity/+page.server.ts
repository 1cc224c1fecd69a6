import { desc, eq } from 'drizzle-orm';
import { requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { auditLog, users } from '$lib/server/db/schema';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event, 'owner');
	const entries = await db
		.select({
			id: auditLog.id,
			at: auditLog.at,
			action: auditLog.action,
			detail: auditLog.detail,
			who: users.name,
			whoEmail: users.email
		})
		.from(auditLog)
		.leftJoin(users, eq(users.id, auditLog.personId))
		.where(eq(auditLog.venueId, venue.id))
		.orderBy(desc(auditLog.at), desc(auditLog.id))
		.limit(200);
	return { entries };
};
