import { randomBytes } from 'node:crypto';
import type { HandleServerError } from '@sveltejs/kit';

/** Words for the framework's own refusals, which arrive here with its terse English. */
const WORDS: Record<number, string> = {
	400: 'That request could not be understood. Load the page again and retry.',
	404: 'There is nothing at this address. Check the link, or go back to your venues.',
	405: 'This address does not take that kind of request.',
	413: 'That is too large to send in one go.',
	415: 'That was not sent the way this page expects. Load the page again and retry.'
};

/**
 * Errors nobody threw on purpose. A fault of ours is logged with a short reference the person can
 * quote, and they get plain words and the reference, never the error's own text. The framework's
 * refusals (no such page, wrong method) get plain words for their status.
 */
export const handleError: HandleServerError = ({ error, event, status }) => {
	if (status < 500) return { message: WORDS[status] ?? WORDS[400] };
	const reference = randomBytes(3).toString('hex');
	console.error(
		`[error ${reference}] ${event.request.method} ${event.url.pathname} (${event.route.id ?? 'no route'})`,
		error
	);
	return {
		message: `Something went wrong on our side. Reference: ${reference}`,
		code: reference
	};
};
