/**
 * Where to send someone after signing in, switching theme and the like, when the target came from
 * the request (a query parameter, a form field, a Referer). Only a path on this site is allowed;
 * anything else gives the fallback. Browsers read `\` as `/` and drop tabs and new lines inside
 * URLs, and some targets are decoded again on the way, so the checks run on the target as given
 * and on up to three rounds of percent-decoding.
 */
const PLACEHOLDER = 'http://gloaming.invalid';
const MAX_LENGTH = 2000;

interface Options {
	/** Used when the target is missing or not safe. Must itself be a site path. */
	fallback?: string;
	/** An absolute URL on this origin is accepted too (as its path), for Referer and Auth.js. */
	origin?: string;
}

function isSitePath(path: string): boolean {
	// Anything that is not a printable character, plus the backslash, has no place in a target.
	// eslint-disable-next-line no-control-regex -- control characters are exactly what is refused
	if (/[\u0000-\u0020\u007f\\]/.test(path)) return false;
	if (!path.startsWith('/') || path.startsWith('//')) return false;
	let decoded = path;
	for (let round = 0; round < 3; round++) {
		let next: string;
		try {
			next = decodeURIComponent(decoded);
		} catch {
			return false;
		}
		if (next === decoded) break;
		decoded = next;
		const start = decoded.replace(/[\t\n\r]/g, '').slice(0, 2);
		if (!start.startsWith('/') || start === '//' || start === '/\\') return false;
	}
	const resolved = new URL(path, PLACEHOLDER);
	return resolved.origin === PLACEHOLDER;
}

export function safeRedirect(target: unknown, options: Options = {}): string {
	const fallback = options.fallback ?? '/';
	if (typeof target !== 'string' || target.length === 0 || target.length > MAX_LENGTH)
		return fallback;
	let path = target;
	if (options.origin && !target.startsWith('/')) {
		let url: URL;
		try {
			url = new URL(target);
		} catch {
			return fallback;
		}
		if (url.origin !== new URL(options.origin).origin) return fallback;
		path = url.pathname + url.search + url.hash;
	}
	return isSitePath(path) ? path : fallback;
}
