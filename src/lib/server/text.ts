/**
 * Text that cannot be stored: PostgreSQL refuses the NUL character in text and jsonb, and jsonb
 * refuses a lone half of a surrogate pair. Both arrive by pasting from other programs or from
 * careless clients. Every form and JSON reader checks with these helpers before anything is
 * stored, so the person gets a message beside the field instead of a server error.
 */

// NUL (matching it is the point, so the control-character rule is off here), a high surrogate
// not followed by a low one, or a low surrogate not preceded by a high one.
// eslint-disable-next-line no-control-regex
const UNSTORABLE = /\u0000|[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;

export const UNSTORABLE_TEXT =
	'This has an invisible character that cannot be saved (it often comes from copying out of another program). Retype it, or paste it as plain text.';

export function isUnstorable(text: string) {
	return UNSTORABLE.test(text);
}

/**
 * Dotted paths of every string (value or key) in a value that cannot be stored; `depth` keeps only
 * the first segments, so a flat form's error lands on its field. A bad key is reported at the key.
 */
export function unstorablePaths(value: unknown, depth = Infinity): string[] {
	const found = new Set<string>();
	const walk = (v: unknown, path: string[], seen: Set<object>) => {
		if (typeof v === 'string') {
			if (isUnstorable(v)) found.add(path.slice(0, depth).join('.') || 'form');
			return;
		}
		if (!v || typeof v !== 'object' || seen.has(v)) return;
		seen.add(v);
		for (const [k, inner] of Object.entries(v)) {
			if (isUnstorable(k)) {
				found.add(path.slice(0, depth).join('.') || 'form');
				continue;
			}
			walk(inner, [...path, k], seen);
		}
	};
	walk(value, [], new Set());
	return [...found];
}

/** Field errors for unstorable text, or null when everything can be stored. */
export function unstorableErrors(value: unknown, depth = Infinity) {
	const paths = unstorablePaths(value, depth);
	if (!paths.length) return null;
	return Object.fromEntries(paths.map((p) => [p, [UNSTORABLE_TEXT]])) as Record<string, string[]>;
}
