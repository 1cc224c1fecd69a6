/** True when PostgreSQL refused a row for breaking a unique constraint (SQLSTATE 23505). */
export function isUniqueViolation(e: unknown): boolean {
	for (let err = e; err && typeof err === 'object'; err = (err as { cause?: unknown }).cause) {
		if ((err as { code?: unknown }).code === '23505') return true;
	}
	return false;
}
