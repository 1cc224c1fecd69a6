/** Rows grouped by a key, in their order (Map.groupBy arrives only in Node 21). */
export function groupBy<T>(rows: readonly T[], key: (row: T) => string): Map<string, T[]> {
	const m = new Map<string, T[]>();
	for (const r of rows) {
		const list = m.get(key(r));
		if (list) list.push(r);
		else m.set(key(r), [r]);
	}
	return m;
}
