/** The PostgreSQL error behind a Drizzle error (Drizzle wraps it as `cause`), if any. */
function pgError(e: unknown): { code?: unknown; constraint_name?: unknown } | null {
	for (let err = e; err && typeof err === 'object'; err = (err as { cause?: unknown }).cause) {
		if (typeof (err as { code?: unknown }).code === 'string') return err as never;
	}
	return null;
}

/**
 * True when PostgreSQL refused a row for breaking a unique constraint (SQLSTATE 23505), optionally
 * only that named constraint.
 */
export function isUniqueViolation(e: unknown, constraint?: string): boolean {
	const err = pgError(e);
	return err?.code === '23505' && (!constraint || err.constraint_name === constraint);
}

/** True when PostgreSQL refused a change for breaking a foreign key (SQLSTATE 23503). */
export function isForeignKeyViolation(e: unknown): boolean {
	return pgError(e)?.code === '23503';
}

/**
 * True when PostgreSQL refused a change that would take kept history with it (SQLSTATE 23001,
 * raised by the append-only trigger on check results, sign-offs and stand-downs).
 */
export function isRestrictViolation(e: unknown): boolean {
	return pgError(e)?.code === '23001';
}

/**
 * What to tell people when two saves race for one name: the unique constraints a person can hit
 * by typing, with the field the message belongs beside.
 */
export const UNIQUE_WORDS: Record<string, { field: string; message: string }> = {
	rooms_venue_name: { field: 'name', message: 'This venue already has a room with that name.' },
	positions_venue_name: {
		field: 'name',
		message: 'This venue already has a position with that name.'
	},
	scenes_venue_name: { field: 'name', message: 'A scene of this venue already has that name.' }
};

/** Field errors for a unique-constraint refusal people can fix, or null for any other error. */
export function uniqueErrors(e: unknown): Record<string, string[]> | null {
	const err = pgError(e);
	if (err?.code !== '23505') return null;
	const words = UNIQUE_WORDS[String(err.constraint_name)];
	return words
		? { [words.field]: [words.message] }
		: {
				form: [
					'That already exists: someone saved the same thing a moment ago. Load the page again.'
				]
			};
}
