import { sql, type AnyColumn, type SQL } from 'drizzle-orm';

/** A PostgreSQL array literal, each element quoted: '{"a","b"}'. */
const arrayLiteral = (values: readonly string[]) =>
	`{${values.map((v) => `"${v.replace(/[\\"]/g, (c) => `\\${c}`)}"`).join(',')}}`;

/**
 * `column = any($1::uuid[])`: a list of ids passed as one array parameter, so a statement's
 * parameter count does not grow with the list (PostgreSQL refuses more than 65,535). An empty
 * list matches nothing.
 */
export function anyUuid(column: AnyColumn | SQL, ids: readonly string[]): SQL {
	return sql`${column} = any(${arrayLiteral(ids)}::uuid[])`;
}

/** The same for text keys (people's ids are text). */
export function anyText(column: AnyColumn | SQL, values: readonly string[]): SQL {
	return sql`${column} = any(${arrayLiteral(values)}::text[])`;
}
