import type { Db } from './db/client';
import { auditLog } from './db/schema';

/** Append one line to the venue's audit log: who did what, when. */
export async function audit(
	db: Pick<Db, 'insert'>,
	entry: {
		venueId: string | null;
		personId: string | null;
		action: string;
		detail?: Record<string, unknown>;
	}
) {
	await db.insert(auditLog).values({ ...entry, detail: entry.detail ?? {} });
}
