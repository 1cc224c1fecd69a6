import { z } from 'zod';
import './messages';

import { formatQuantity, readField, type QuantityKind } from '../quantity';

const blank = (v: unknown) =>
	v === '' || v === null || (typeof v === 'string' && v.trim() === '') ? undefined : v;

export interface NumOpts {
	min?: number;
	max?: number;
	int?: boolean;
	gt?: number;
	/** What the field holds, so "4K7", "330k" or "20 mA" are read the way the trade writes them. */
	kind?: QuantityKind;
	/** The field's unit as a fraction of the kind's SI unit: 1e-3 for a field kept in mA or ms. */
	scale?: number;
}

/** A bound written in the field's own unit, for a message: "100 %", "4.7 kΩ", "3,600". */
function bound(v: number, opts: NumOpts): string {
	const kind = opts.kind ?? 'plain';
	if (kind === 'percent' || kind === 'plain' || kind === 'count')
		return formatQuantity(v, kind === 'count' ? 'plain' : kind, { digits: 6 });
	return formatQuantity(v * (opts.scale ?? 1), kind, { digits: 6 });
}

/**
 * A number from a form field or JSON, with messages written for people. Text is read with the
 * shared quantity reader (SI prefixes and the IEC 60062 code where the kind allows them); what
 * is out of range is refused with the range, never clamped.
 */
export function num(label: string, opts: NumOpts = {}) {
	return z.unknown().transform((raw, ctx) => {
		const v = blank(raw);
		const fail = (message: string) => {
			ctx.addIssue({ code: 'custom', message, input: raw });
			return z.NEVER;
		};
		if (v === undefined) return fail(`Give ${label.toLowerCase()}.`);
		let n: number;
		if (typeof v === 'number') n = v;
		else if (typeof v === 'string') {
			const r = readField(v, opts.kind ?? 'plain', opts.scale ?? 1);
			if (!r.ok) return fail(`${label}: ${r.message}`);
			n = r.value;
		} else return fail(`${label} must be a number.`);
		if (!Number.isFinite(n)) return fail(`${label} must be a number.`);
		if (opts.int && !Number.isInteger(n)) return fail(`${label} must be a whole number.`);
		if (opts.gt !== undefined && !(n > opts.gt))
			return fail(`${label} must be above ${bound(opts.gt, opts)}.`);
		const outside =
			(opts.min !== undefined && n < opts.min) || (opts.max !== undefined && n > opts.max);
		if (outside) {
			if (opts.min !== undefined && opts.max !== undefined)
				return fail(`${label} must be from ${bound(opts.min, opts)} to ${bound(opts.max, opts)}.`);
			if (opts.min !== undefined)
				return fail(`${label} must be at least ${bound(opts.min, opts)}.`);
			return fail(`${label} must be at most ${bound(opts.max!, opts)}.`);
		}
		return n;
	}) as unknown as z.ZodType<number, unknown>;
}

/** An optional number: blank means none (null). */
export function optNum(label: string, opts: NumOpts = {}) {
	const given = num(label, opts);
	// Not a union: a union would hide the number's own message behind a general one.
	return z
		.unknown()
		.optional()
		.transform((raw, ctx) => {
			if (blank(raw) === undefined) return null;
			const r = given.safeParse(raw);
			if (r.success) return r.data;
			for (const issue of r.error.issues)
				ctx.addIssue({ code: 'custom', message: issue.message, input: raw });
			return z.NEVER;
		}) as unknown as z.ZodType<number | null, unknown>;
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
