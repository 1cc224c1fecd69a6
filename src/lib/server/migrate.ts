import { migrate } from 'drizzle-orm/postgres-js/migrator';
import { sql } from 'drizzle-orm';
import type { Db } from './db/client';

// An advisory lock so several app servers starting together apply migrations once.
const LOCK_KEY = 4_815_162_342;

export async function applyMigrations(db: Db, migrationsFolder = 'drizzle') {
	await db.execute(sql`select pg_advisory_lock(${LOCK_KEY})`);
	try {
		await migrate(db, { migrationsFolder });
	} finally {
		await db.execute(sql`select pg_advisory_unlock(${LOCK_KEY})`);
	}
}
