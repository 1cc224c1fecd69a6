import { drizzle } from 'drizzle-orm/postgres-js';
import postgres from 'postgres';
import * as schema from './schema';

/** A Drizzle client on its own postgres.js pool. Scripts and tests use this directly. */
export function createDb(
	url: string,
	options: {
		max?: number;
		/** Called with every statement sent (tests and the bench count them). */
		onStatement?: (query: string, parameters: unknown[]) => void;
	} = {}
) {
	const onStatement = options.onStatement;
	const sql = postgres(url, {
		max: options.max ?? 10,
		onnotice: () => {},
		...(onStatement ? { debug: (_c: number, q: string, p: unknown[]) => onStatement(q, p) } : {})
	});
	return { db: drizzle(sql, { schema }), sql };
}

export type Db = ReturnType<typeof createDb>['db'];
