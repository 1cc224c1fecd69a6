import { z } from 'zod';
import { unstorableErrors } from '../text';

/** Name segments that would reach an object's prototype chain rather than a field of its own. */
const FORBIDDEN_SEGMENTS = new Set(['__proto__', 'constructor', 'prototype']);

export class FieldNameError extends Error {}

/**
 * Form fields named a.b become nested objects, so one schema checks forms and JSON alike. Every
 * object made here has no prototype, so no field name can reach Object.prototype, and a name with
 * a `__proto__`, `constructor` or `prototype` segment (or an empty one) is refused outright.
 */
export function nest(raw: Record<string, unknown>): Record<string, unknown> {
	const out: Record<string, unknown> = Object.create(null);
	for (const key of Object.keys(raw)) {
		const parts = key.split('.');
		for (const p of parts) {
			if (FORBIDDEN_SEGMENTS.has(p) || p === '')
				throw new FieldNameError(`The form sent a field this page does not have (${key}).`);
		}
		let at = out;
		for (const p of parts.slice(0, -1)) {
			const next = Object.hasOwn(at, p) ? at[p] : undefined;
			if (typeof next !== 'object' || next === null) at[p] = Object.create(null);
			at = at[p] as Record<string, unknown>;
		}
		at[parts[parts.length - 1]] = raw[key];
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

/** A form's text fields as own properties (a field named __proto__ stays a plain field). */
export async function readForm(request: Request): Promise<Record<string, string>> {
	const form = await request.formData().catch(() => new FormData());
	const entries: [string, string][] = [];
	for (const [k, v] of form.entries()) if (typeof v === 'string') entries.push([k, v]);
	return Object.fromEntries(entries);
}

/** Parse a form whose field names are dotted paths with a nested schema. */
export async function parseNestedForm<T extends z.ZodType>(request: Request, schema: T) {
	const raw = await readForm(request);
	const unstorable = unstorableErrors(raw, 1);
	if (unstorable) return { ok: false as const, errors: unstorable, raw };
	let nested: Record<string, unknown>;
	try {
		nested = nest(raw);
	} catch (e) {
		if (!(e instanceof FieldNameError)) throw e;
		return { ok: false as const, errors: { form: [e.message] } as Record<string, string[]>, raw };
	}
	const result = schema.safeParse(nested);
	if (result.success) return { ok: true as const, data: result.data as z.infer<T>, raw };
	return { ok: false as const, errors: errorsByPath(result.error), raw };
}
