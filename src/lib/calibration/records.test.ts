import { describe, expect, it } from 'vitest';
import { parse } from 'csv-parse/sync';
import { CAPTURE_CSV, readRecords } from './records';
import { plainNumber } from './capture';

/** A small repeatable generator (a linear congruential one) so every run reads the same files. */
function random(seed: number) {
	let s = seed;
	return () => (s = (s * 1103515245 + 12345) % 2147483648) / 2147483648;
}

const PIECES = [
	'1,idle',
	'0.5,3,present',
	'#a comment',
	'# a "quoted" comment',
	'',
	' ',
	'"4",idle',
	'5,"pre{EOL}sent"',
	'6,"say ""idle"""',
	'7,"two{EOL}{EOL}lines"',
	'time,reading,label',
	'8,,idle',
	'ü,idle',
	'z'.repeat(1400) + ',idle',
	'é'.repeat(1370) + ',idle'
];

/** Each record with the line it ends on, as csv-parse reads the whole file at once. */
function whole(text: string) {
	try {
		const rows = parse(text, { ...CAPTURE_CSV, bom: true, info: true }) as unknown as {
			record: string[];
			info: { lines: number };
		}[];
		return { records: rows.map((r) => `${r.info.lines}:${JSON.stringify(r.record)}`), code: null };
	} catch (error) {
		return { records: null, code: (error as { code?: string }).code ?? 'other' };
	}
}

async function streamed(chunks: (string | Uint8Array)[]) {
	const records: string[] = [];
	const end = await readRecords(chunks, (fields, line) => {
		records.push(`${line}:${JSON.stringify(fields)}`);
		return true;
	});
	return { records, code: end.failure?.code ?? null };
}

describe('readRecords', () => {
	it('gives the records and lines csv-parse gives reading the whole file, in any chunks', async () => {
		const rand = random(17);
		const differ: string[] = [];
		for (let n = 0; n < 120; n++) {
			const eol = rand() < 0.4 ? '\r\n' : '\n';
			let text = (rand() < 0.2 ? '\ufeff' : '') + 'reading,label' + eol;
			const count = 2 + Math.floor(rand() * 10);
			for (let i = 0; i < count; i++)
				text += PIECES[Math.floor(rand() * PIECES.length)].replaceAll('{EOL}', eol) + eol;
			if (rand() < 0.3) text = text.slice(0, -eol.length);
			const bytes = Buffer.from(text);
			const chunks: Uint8Array[] = [];
			for (let i = 0; i < bytes.length;) {
				const size = rand() < 0.5 ? 1 + Math.floor(rand() * 5) : 64 + Math.floor(rand() * 4000);
				chunks.push(bytes.subarray(i, i + size));
				i += size;
			}
			const expected = whole(text);
			const got = await streamed(chunks);
			// csv-parse 7 reading the whole file with the same options is the reference
			const same = expected.records
				? JSON.stringify(got.records) === JSON.stringify(expected.records)
				: got.code === expected.code;
			if (!same) differ.push(JSON.stringify(text));
		}
		expect(differ).toEqual([]);
	});

	it('counts lines after a quoted field with line breaks as csv-parse does', async () => {
		const text = 'reading,label\r\n1,"id\r\nle"\r\n\r\n#note\r\n2,present\r\n';
		const got = await streamed([text]);
		// csv-parse 7, whole file, is the reference; it counts the CR and the LF of an ending inside
		// quotes as a line each, so by its count the blank line is 5, the comment 6 and the last row 7
		expect(got.records).toEqual(whole(text).records);
		expect(got.records.at(-1)).toBe('7:["2","present"]');
	});

	it('stops when told to and reports nothing the reader finds further on', async () => {
		const seen: number[] = [];
		const end = await readRecords(['1,idle\n2,idle\n3,"idle\n'], (_f, line) => {
			seen.push(line);
			return line < 2;
		});
		// the sink stopped at line 2, before the unclosed quote on line 3
		expect(seen).toEqual([1, 2]);
		expect(end.failure).toBeNull();
	});
});

describe('plainNumber', () => {
	it('reads what the NUMBER pattern and Number() read, and refuses what the pattern refuses', () => {
		const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i;
		const rand = random(5);
		const alphabet = '0123456789.eE+-x ';
		const samples = [
			'0',
			'-0',
			'.5',
			'5.',
			'+1e5',
			'1e999',
			'0x10',
			'Infinity',
			'',
			'-',
			'1e',
			'1e+'
		];
		for (let i = 0; i < 20000; i++) {
			let s = '';
			const length = 1 + Math.floor(rand() * 18);
			for (let j = 0; j < length; j++)
				s += rand() < 0.8 ? alphabet[Math.floor(rand() * 10)] : alphabet[Math.floor(rand() * 17)];
			samples.push(s);
		}
		let numbers = 0;
		const differ: string[] = [];
		for (const s of samples) {
			// ECMAScript Number(): the correctly rounded double of the decimal
			const expected = NUMBER.test(s) ? Number(s) : NaN;
			if (!Object.is(plainNumber(s), expected)) differ.push(s);
			if (!Number.isNaN(expected)) numbers++;
		}
		expect(differ).toEqual([]);
		// the generated samples include plenty of both kinds
		expect(numbers).toBeGreaterThan(5000);
	});
});
