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
	return resolve(event);
};
