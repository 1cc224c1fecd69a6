import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parse } from 'csv-parse/sync';
import { describe, expect, it } from 'vitest';
import { cIdentifier, levelTableToC, levelTableToCsv, levelTableToJson } from './export';
import { buildLevelTable } from './level-table';

// ISO/IEC 9899 §6.4.2.1: an identifier is a nondigit followed by nondigits and digits.
const C_IDENTIFIER = /^[A-Za-z_][A-Za-z0-9_]*$/;

describe('cIdentifier', () => {
	it('makes valid C identifiers from display names', () => {
		const names = [
			'Hall 3 — Lantern fade',
			'3 lanterns',
			'Crème brûlée',
			'',
			'!!!',
			'x'.repeat(100)
		];
		for (const name of names) {
			const id = cIdentifier(name);
			// ISO/IEC 9899 §6.4.2.1 identifier grammar
			expect(id).toMatch(C_IDENTIFIER);
			// ISO/IEC 9899 §5.2.4.1: 63 significant initial characters in an internal identifier
			expect(id.length).toBeLessThanOrEqual(63);
			// ISO/IEC 9899 §7.1.3: names starting with an underscore are reserved
			expect(id.startsWith('_')).toBe(false);
		}
		expect(cIdentifier('Hall 3 — Lantern fade')).toBe('hall_3_lantern_fade');
		expect(cIdentifier('3 lanterns')).toBe('table_3_lanterns');
		expect(cIdentifier('Crème brûlée')).toBe('creme_brulee');
	});

	it('steers clear of keywords and type names', () => {
		// ISO/IEC 9899 §6.4.1: keywords cannot be identifiers
		expect(cIdentifier('int')).toBe('int_table');
		expect(cIdentifier('Static')).toBe('static_table');
		// POSIX.1-2017 §2.2.2: names ending in _t are reserved for types
		expect(cIdentifier('size_t')).toBe('size_t_table');
	});
});

describe('levelTableToC', () => {
	it('writes an 8-bit table as uint8_t', () => {
		const c = levelTableToC(buildLevelTable({ kind: 'cie' }, { bits: 8 }), 'Lantern fade');
		// ISO/IEC 9899 §7.20.1.1: uint8_t holds 0..255 exactly
		expect(c).toContain('static const uint8_t lantern_fade[256] = {');
		expect(c).toContain('#include <stdint.h>');
		expect(c).toMatch(/^\/\*\n \* Level table: Lantern fade\n \* Curve: CIE 1976 lightness\n/);
		expect(c).toContain('256 levels, 8-bit PWM (counts 0..255)');
	});

	it('writes wider tables as uint16_t with every count in order', () => {
		const table = buildLevelTable({ kind: 'gamma', exponent: 2.2 }, { bits: 12, levels: 64 });
		const c = levelTableToC(table, 'drop');
		// ISO/IEC 9899 §7.20.1.1: uint16_t holds 0..65535
		expect(c).toContain('static const uint16_t drop[64] = {');
		// ISO/IEC 9899 §6.7.9: the initializer list is the values between the braces, comma separated
		const body = c.slice(c.indexOf('{') + 1, c.lastIndexOf('}'));
		expect(body.split(',').map((v) => Number(v.trim()))).toEqual(table.counts);
		expect(c.trimEnd().endsWith('};')).toBe(true);
	});

	it('keeps a name from closing the comment early', () => {
		// ISO/IEC 9899 §6.4.9: a comment ends at the first */
		const c = levelTableToC(buildLevelTable({ kind: 'linear' }, { bits: 8 }), 'evil */ name');
		expect(c.indexOf('*/')).toBe(c.indexOf('*/\n#include'));
	});
});

function findCompiler(): string | null {
	for (const cc of ['cc', 'gcc', 'clang']) {
		try {
			execFileSync(cc, ['--version'], { stdio: 'ignore' });
			return cc;
		} catch {
			// try the next one
		}
	}
	return null;
}
const compiler = findCompiler();

describe.skipIf(compiler === null)('levelTableToC with a C compiler', () => {
	it('compiles cleanly as C99 for 8 and 16 bits', () => {
		// ISO/IEC 9899:1999, checked by the system compiler in strict mode
		const dir = mkdtempSync(join(tmpdir(), 'level-table-'));
		try {
			const file = join(dir, 'table.c');
			const eight = levelTableToC(buildLevelTable({ kind: 'cie' }, { bits: 8 }), 'int');
			const sixteen = levelTableToC(buildLevelTable({ kind: 'cie' }, { bits: 16 }), '3 */ bay');
			writeFileSync(
				file,
				`${eight}\n${sixteen}\nint main(void) { return int_table[1] + table_3_bay[1]; }\n`
			);
			const run = () =>
				execFileSync(
					compiler!,
					['-std=c99', '-pedantic-errors', '-Wall', '-Werror', '-fsyntax-only', file],
					{
						stdio: 'pipe'
					}
				);
			expect(run).not.toThrow();
		} finally {
			rmSync(dir, { recursive: true, force: true });
		}
	});
});

describe('levelTableToJson', () => {
	it('round-trips through a JSON parser', () => {
		// RFC 8259: the export is one JSON object
		const table = buildLevelTable({ kind: 'cie' }, { bits: 10, levels: 32 });
		const parsed = JSON.parse(levelTableToJson(table, 'Bay "2"'));
		expect(parsed).toEqual({
			name: 'Bay "2"',
			curve: { kind: 'cie' },
			description: 'CIE 1976 lightness',
			bits: 10,
			levels: 32,
			maxCount: 1023,
			counts: table.counts
		});
	});
});

describe('levelTableToCsv', () => {
	it('has a header row, CRLF line ends and one row per level', () => {
		const table = buildLevelTable({ kind: 'cie' }, { bits: 8, levels: 101 });
		const csv = levelTableToCsv(table);
		// RFC 4180 §2: records end in CRLF; an optional header line comes first
		expect(csv.startsWith('index,level,duty,count\r\n')).toBe(true);
		const rows = parse(csv, { columns: true }) as Record<string, string>[];
		expect(rows).toHaveLength(101);
		// CIE 015:2004: L*=50 -> Y=0.1841865185 -> 47 of 255
		expect(rows[50]).toEqual({ index: '50', level: '0.5', duty: '0.18431373', count: '47' });
		expect(rows[100]).toEqual({ index: '100', level: '1', duty: '1', count: '255' });
	});
});
