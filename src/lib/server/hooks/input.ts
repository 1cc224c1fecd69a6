import { error, type Handle } from '@sveltejs/kit';
import { isUnstorable } from '../text';

/**
 * Path parameters and query strings are refused here when they hold text nothing can store or
 * look up (a NUL or half a surrogate pair), before the venue lookup or any handler queries with
 * them. Bodies are checked by the form and JSON readers, beside the field.
 */
export const inputHandle: Handle = ({ event, resolve }) => {
	const values = [
		...Object.values(event.params),
		...[...event.url.searchParams].flatMap(([k, v]) => [k, v])
	];
	if (values.some((v) => v !== undefined && isUnstorable(v)))
		error(400, 'This address has an invisible character in it. Check the link and try again.');
	if (event.request.method === 'POST' && !isActionName(event.url))
		error(404, 'This page has no action by that name.');
	return resolve(event);
};

/**
 * A form action is named in the query (`?/name`). The framework looks the name up on the page's
 * actions object, so `default` (reserved) and names every object inherits (`constructor`,
 * `toString`, `__proto__`) would reach it as server errors; they are refused as unknown actions.
 */
export function isActionName(url: URL) {
	const param = [...url.searchParams.keys()].find((k) => k.startsWith('/'));
	if (param === undefined) return true;
	const name = param.slice(1);
	return name !== 'default' && !(name in Object.prototype);
}
