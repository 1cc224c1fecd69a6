// Zod's fallback messages, in people's words. Every schema gives its own message where it can; this
// catches what a schema leaves to the library (a wrong type, an unknown choice, a malformed id), so
// no page, form or API answer ever says "Invalid input" or names a field by its internal name.
import { z } from 'zod';
import type { $ZodRawIssue } from 'zod/v4/core';

type Issue = $ZodRawIssue;

const LIMIT_WORDS: Record<string, string> = {
	string: 'characters',
	array: 'items',
	set: 'items',
	file: 'bytes'
};

export function peopleMessage(iss: Issue): string {
	switch (iss.code) {
		case 'invalid_type':
			return iss.input === undefined || iss.input === null || iss.input === ''
				? 'This needs filling in.'
				: iss.expected === 'number'
					? 'This needs to be a number.'
					: iss.expected === 'boolean'
						? 'Choose yes or no.'
						: 'This is not something we can use here.';
		case 'too_small': {
			const min = Number(iss.minimum);
			if (iss.origin === 'string')
				return min <= 1 ? 'This needs filling in.' : `Use at least ${min} characters.`;
			if (iss.origin in LIMIT_WORDS) return `Give at least ${min} ${LIMIT_WORDS[iss.origin]}.`;
			return `This must be at least ${min}.`;
		}
		case 'too_big': {
			const max = Number(iss.maximum);
			if (iss.origin in LIMIT_WORDS) return `Use at most ${max} ${LIMIT_WORDS[iss.origin]}.`;
			return `This must be at most ${max}.`;
		}
		case 'invalid_value':
			return 'Choose one of the options given.';
		case 'invalid_format':
			if (iss.format === 'email') return 'Give an e-mail address, like name@example.com.';
			if (iss.format === 'uuid' || iss.format === 'guid')
				return 'This refers to something we cannot find.';
			if (iss.format === 'url') return 'Give a web address starting with https://.';
			return 'This is not written in a form we can read.';
		case 'unrecognized_keys':
			return `We do not know ${iss.keys.length === 1 ? 'this field' : 'these fields'}: ${iss.keys.join(', ')}.`;
		case 'not_multiple_of':
			return `Use a multiple of ${iss.divisor}.`;
		default:
			return 'This is not something we can use here.';
	}
}

z.config({ customError: (iss) => peopleMessage(iss) });
