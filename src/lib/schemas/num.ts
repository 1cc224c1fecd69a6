import { z } from 'zod';

const blank = (v: unknown) => (v === '' || v === null ? undefined : v);

/** A number from a form field or JSON, with a message written for people. */
export function num(
	label: string,
	opts: { min?: number; max?: number; int?: boolean; gt?: number } = {}
) {
	let n = z.coerce.number({ error: `${label} must be a number.` }).refine(Number.isFinite, {
		message: `${label} must be a number.`
	});
	if (opts.int) n = n.refine(Number.isInteger, { message: `${label} must be a whole number.` });
	if (opts.gt !== undefined)
		n = n.refine((v) => v > opts.gt!, { message: `${label} must be above ${opts.gt}.` });
	if (opts.min !== undefined)
		n = n.refine((v) => v >= opts.min!, { message: `${label} must be at least ${opts.min}.` });
	if (opts.max !== undefined)
		n = n.refine((v) => v <= opts.max!, { message: `${label} must be at most ${opts.max}.` });
	return z.preprocess(
		blank,
		z.union([z.undefined(), n]).refine((v) => v !== undefined, {
			message: `Give ${label.toLowerCase()}.`
		})
	) as unknown as z.ZodType<number, unknown>;
}

/** An optional number: blank means none (null). */
export function optNum(label: string, opts: Parameters<typeof num>[1] = {}) {
	return z
		.preprocess(blank, z.union([z.undefined(), num(label, opts)]))
		.transform((v) => (v === undefined ? null : v)) as unknown as z.ZodType<number | null, unknown>;
}

export const text = (label: string, max = 80) =>
	z
		.string({ error: `Give ${label.toLowerCase()}.` })
		.trim()
		.min(1, `Give ${label.toLowerCase()}.`)
		.max(max, `Use at most ${max} characters.`);

export const optText = (max = 2000) =>
	z
		.string()
		.trim()
		.max(max, `Use at most ${max} characters.`)
		.optional()
		.nullable()
		.transform((v) => (v ? v : null));
