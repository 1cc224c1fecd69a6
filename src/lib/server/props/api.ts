import { json } from '@sveltejs/kit';
import type { z } from 'zod';
import { errorsByPath } from './form';
import { unstorableErrors } from '../text';

/** Read and check a JSON body; a bad one is a 400 with the problems by field, never a 500. */
export async function readJson<T extends z.ZodType>(request: Request, schema: T) {
	const body = await request.json().catch(() => undefined);
	if (body === undefined)
		return {
			ok: false as const,
			response: json({ message: 'Send a JSON body.' }, { status: 400 })
		};
	// null, a bare string or a list: say what is wanted rather than the checker's own words.
	if (typeof body !== 'object' || body === null || Array.isArray(body))
		return {
			ok: false as const,
			response: json(
				{ message: 'Send a JSON object with the fields by name, like {"name": "…"}.' },
				{ status: 400 }
			)
		};
	const unstorable = unstorableErrors(body);
	if (unstorable)
		return {
			ok: false as const,
			response: json({ message: 'Some fields need fixing.', errors: unstorable }, { status: 400 })
		};
	const result = schema.safeParse(body);
	if (!result.success)
		return {
			ok: false as const,
			response: json(
				{ message: 'Some fields need fixing.', errors: errorsByPath(result.error) },
				{ status: 400 }
			)
		};
	return { ok: true as const, data: result.data as z.infer<T> };
}
