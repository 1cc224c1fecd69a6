import { z } from 'zod';
import '$lib/schemas/messages';
import { unstorableErrors } from './text';

/** Parse a form with a zod schema; errors come back per field, in words meant for people. */
export async function parseForm<T extends z.ZodType>(request: Request, schema: T) {
	const form = await request.formData().catch(() => new FormData());
	// Own properties only: a field named __proto__ stays a field rather than setting the prototype.
	const raw: Record<string, FormDataEntryValue | FormDataEntryValue[]> = Object.fromEntries(
		[...new Set(form.keys())].map((key) => {
			const all = form.getAll(key);
			return [key, all.length > 1 ? all : all[0]];
		})
	);
	const unstorable = unstorableErrors(raw, 1);
	if (unstorable) return { ok: false as const, errors: unstorable, raw };
	const result = schema.safeParse(raw);
	if (result.success) return { ok: true as const, data: result.data as z.infer<T>, raw };
	const errors = z.flattenError(result.error).fieldErrors as Record<string, string[]>;
	return { ok: false as const, errors, raw };
}

/** Values to send back to the form after a failure, so nothing the person typed is lost. */
export function keep(raw: Record<string, unknown>, ...omit: string[]) {
	const out: Record<string, string> = {};
	for (const [k, v] of Object.entries(raw)) {
		if (!omit.includes(k) && typeof v === 'string') out[k] = v;
	}
	return out;
}
