import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { num, optNum } from './num';
import './messages';

const firstMessage = (schema: z.ZodType, input: unknown) => {
	const r = schema.safeParse(input);
	expect(r.success).toBe(false);
	return r.success ? '' : r.error.issues[0].message;
};

describe("zod's fallback messages", () => {
	it.each([
		[z.string(), 42],
		[z.string(), undefined],
		[z.number(), 'x'],
		[z.enum(['a', 'b']), 'c'],
		[z.string().uuid(), 'not-an-id'],
		[z.email(), 'nobody'],
		[z.object({ a: z.string() }).strict(), { a: 'x', b: 1 }],
		[z.array(z.string()).min(2), ['x']],
		[z.union([z.number(), z.boolean()]), 'x'],
		[z.string().max(3), 'abcdef']
	])('%# reads as words, never "Invalid input" or a type name', (schema, input) => {
		const message = firstMessage(schema as z.ZodType, input);
		expect(message).not.toMatch(/invalid input|expected|received|nan|undefined|string|uuid/i);
		expect(message).toMatch(/^[A-Z].*\.$/);
	});
});

describe('num', () => {
	const level = num('High level', { kind: 'percent', min: 0, max: 100 });
	it('refuses a value out of range with the range, never clamping it', () => {
		expect(firstMessage(level, '150')).toBe('High level must be from 0 % to 100 %.');
		expect(level.parse('15')).toBe(15);
	});
	it('reads the trade notation in a field of its kind, in the field unit', () => {
		const resistor = num('Resistor', { kind: 'ohms', gt: 0, max: 1e9 });
		expect(resistor.parse('4M7')).toBe(4_700_000);
		expect(resistor.parse('4.7 MΩ')).toBe(4_700_000);
		const current = num('Current per string', { kind: 'amps', scale: 1e-3, gt: 0, max: 5000 });
		expect(current.parse('20')).toBe(20);
		expect(current.parse('0.02 A')).toBe(20);
		expect(firstMessage(current, '6 A')).toBe('Current per string must be at most 5 A.');
	});
	it('says what is missing or unreadable, with the label, and never takes a blank as zero', () => {
		expect(firstMessage(level, '')).toBe('Give high level.');
		expect(firstMessage(level, '   ')).toBe('Give high level.');
		expect(firstMessage(level, 'abc')).toMatch(
			/^High level: “abc” is not a percentage we can read/
		);
		expect(optNum('Loop time', { kind: 'seconds' }).parse('')).toBeNull();
		expect(firstMessage(num('Prescaler', { int: true, min: 1 }), '2.5')).toBe(
			'Prescaler must be a whole number.'
		);
	});
});
