import { sql, type AnyColumn, type SQL } from 'drizzle-orm';

/**
 * `column = any($1::uuid[])`: a list of ids passed as one array parameter, so a statement's
 * parameter count does not grow with the list (PostgreSQL refuses more than 65,535). The ids come
 * from the database; an empty list matches nothing.
 */
export function anyUuid(column: AnyColumn | SQL, ids: readonly string[]): SQL {
	return sql`${column} = any(${`{${ids.join(',')}}`}::uuid[])`;
}
