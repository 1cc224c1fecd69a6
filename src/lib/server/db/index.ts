import { env } from '$env/dynamic/private';
import { building } from '$app/environment';
import { createDb } from './client';

// postgres.js connects on first query, so building (with no database) only creates an idle pool.
// The server's init hook refuses to start without DATABASE_URL.
const client = createDb(
	building || !env.DATABASE_URL ? 'postgres://unset@127.0.0.1:1/unset' : env.DATABASE_URL
);

export const db = client.db;
/** The postgres.js client itself, for LISTEN (live checklist progress). */
export const pg = client.sql;

export async function closeDb() {
	await client.sql.end({ timeout: 5 });
}
