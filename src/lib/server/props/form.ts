import { z } from 'zod';
import { unstorableErrors } from '../text';

/** Form fields named a.b become nested objects, so one schema checks forms and JSON alike. */
export function nest(raw: Record<string, unknown>) {
	const out: Record<string, unknown> = {};
	for (const [key, value] of Object.entries(raw)) {
		const parts = key.split('.');
		let at = out;
		for (const p of parts.slice(0, -1)) {
			if (typeof at[p] !== 'object' || at[p] === null) at[p] = {};
			at = at[p] as Record<string, unknown>;
		}
		at[parts[parts.length - 1]] = value;
	}
	return out;
}

/** Field errors keyed by dotted path, for forms whose fields are named that way. */
export function errorsByPath(error: z.ZodError) {
	const errors: Record<string, string[]> = {};
	for (const issue of error.issues) {
		const key = issue.path.join('.') || 'form';
		(errors[key] ??= []).push(issue.message);
	}
	return errors;
}

export async function readForm(request: Request) {
	const form = await request.formData().catch(() => new FormData());
	const raw: Record<string, string> = {};
	for (const [k, v] of form.entries()) if (typeof v === 'string') raw[k] = v;
	return raw;
}

/** Parse a form whose field names are dotted paths with a nested schema. */
export async function parseNestedForm<T extends z.ZodType>(request: Request, schema: T) {
	const raw = await readForm(request);
	const unstorable = unstorableErrors(raw, 1);
	if (unstorable) return { ok: false as const, errors: unstorable, raw };
	const result = schema.safeParse(nest(raw));
	if (result.success) return { ok: true as const, data: result.data as z.infer<T>, raw };
	return { ok: false as const, errors: errorsByPath(result.error), raw };
}
