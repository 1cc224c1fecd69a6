import { drizzle } from 'drizzle-orm/postgres-js';
import postgres from 'postgres';
import * as schema from './schema';

/** A Drizzle client on its own postgres.js pool. Scripts and tests use this directly. */
export function createDb(url: string, options: { max?: number } = {}) {
	const sql = postgres(url, { max: options.max ?? 10, onnotice: () => {} });
	return { db: drizzle(sql, { schema }), sql };
}

export type Db = ReturnType<typeof createDb>['db'];
