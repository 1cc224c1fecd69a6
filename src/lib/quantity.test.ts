import { describe, expect, it } from 'vitest';
import {
	fieldMeaning,
	fieldNumber,
	formatQuantity,
	meaning,
	parseQuantity,
	readField,
	type QuantityKind
} from './quantity';

const read = (text: string, kind: QuantityKind) => {
	const r = parseQuantity(text, kind);
	if (!r.ok) throw new Error(`${text}: ${r.message}`);
	return r.value;
};

describe('parseQuantity: the letter-and-digit code', () => {
	// IEC 60062:2016 §4 examples of resistance values, as listed in the standard's table of the
	// letter and digit code (R47 … 4M7).
	it.each([
		['R47', 0.47],
		['4R7', 4.7],
		['470R', 470],
		['4K7', 4700],
		['47K', 47_000],
		['47K3', 47_300],
		['470K', 470_000],
		['4M7', 4_700_000]
	])('IEC 60062 resistance %s = %d Ω', (code, ohms) => {
		expect(read(code, 'ohms')).toBe(ohms);
	});

	// IEC 60062 capacitance letters p, n, µ, m in place of the decimal point.
	it.each([
		['p68', 0.68e-12],
		['4p7', 4.7e-12],
		['2n2', 2.2e-9],
		['4n7', 4.7e-9],
		['47n', 47e-9],
		['4µ7', 4.7e-6],
		['4u7', 4.7e-6],
		['1µ0', 1e-6]
	])('IEC 60062 capacitance %s = %d F', (code, farads) => {
		expect(read(code, 'farads')).toBe(farads);
	});

	it('reads m as milli and never as mega in a resistance', () => {
		expect(parseQuantity('4m7', 'ohms').ok).toBe(false);
		expect(read('4.7m', 'ohms')).toBe(0.0047);
		expect(read('4.7M', 'ohms')).toBe(4_700_000);
	});
});

describe('parseQuantity: SI prefixes (SI Brochure, 9th edition, table 7)', () => {
	it.each([
		['4.7M', 'ohms', 4.7e6],
		['4.7 MΩ', 'ohms', 4.7e6],
		['4.7MΩ', 'ohms', 4.7e6],
		['4.7 Mohm', 'ohms', 4.7e6],
		['330k', 'ohms', 330e3],
		['330 kΩ', 'ohms', 330e3],
		['330 KΩ', 'ohms', 330e3],
		['2.2e6', 'ohms', 2.2e6],
		['100n', 'farads', 100e-9],
		['100 nF', 'farads', 100e-9],
		['10 µF', 'farads', 10e-6],
		['10 μF', 'farads', 10e-6], // Greek mu as well as the micro sign
		['10uF', 'farads', 10e-6],
		['20 mA', 'amps', 0.02],
		['20m', 'amps', 0.02],
		['0.02', 'amps', 0.02],
		['300 ms', 'seconds', 0.3],
		['1.5 s', 'seconds', 1.5],
		['2.5 kHz', 'hertz', 2500],
		['15 %', 'percent', 15],
		['15%', 'percent', 15],
		['12,000', 'count', 12_000],
		['-3.5', 'plain', -3.5],
		['.5', 'plain', 0.5]
	] as const)('%s as %s = %d', (text, kind, value) => {
		expect(read(text, kind)).toBe(value);
	});

	it('refuses what it cannot read, in words, naming a way to write it', () => {
		const bad: [string, QuantityKind][] = [
			['', 'ohms'],
			['4,7', 'ohms'],
			['abc', 'plain'],
			['1-5-0', 'percent'],
			['3m', 'seconds'],
			['10 kF', 'farads'],
			['5 V', 'amps'],
			['Infinity', 'plain'],
			['1e999', 'plain']
		];
		for (const [text, kind] of bad) {
			const r = parseQuantity(text, kind);
			expect(r.ok, text).toBe(false);
			if (!r.ok) {
				expect(r.message).not.toMatch(/invalid input|finite|NaN|undefined/i);
				expect(r.message.length).toBeGreaterThan(8);
			}
		}
		const comma = parseQuantity('4,7', 'ohms');
		expect(!comma.ok && comma.message).toBe('Use a point for decimals (4.7, not 4,7).');
	});
});

describe('formatQuantity', () => {
	it.each([
		[4700, 'ohms', '4.7 kΩ'],
		[4_700_000, 'ohms', '4.7 MΩ'],
		[330, 'ohms', '330 Ω'],
		[999_700, 'ohms', '1 MΩ'], // rounding carries into the next prefix
		[100e-9, 'farads', '100 nF'],
		[2.2e-9, 'farads', '2.2 nF'],
		[0.0213, 'amps', '21.3 mA'],
		[0.3, 'seconds', '300 ms'],
		[12.5, 'seconds', '12.5 s'],
		[15.04, 'percent', '15 %'],
		[0, 'ohms', '0 Ω'],
		[827.4853115639694, 'count', '827'],
		[904.7208333333328, 'count', '905'],
		[12_000, 'count', '12,000'],
		[3.14159, 'count', '3.14']
	] as const)('%d as %s reads %s', (value, kind, words) => {
		expect(formatQuantity(value, kind)).toBe(words);
	});

	it('matches Intl.NumberFormat rounding to significant digits', () => {
		// The platform's own significant-digit rounding as the reference.
		const ref = new Intl.NumberFormat('en-GB', { maximumSignificantDigits: 3 });
		for (const v of [1.005, 2.675, 123.45, 0.012345, 987.65, 55.55]) {
			expect(formatQuantity(v, 'percent')).toBe(`${ref.format(v)} %`);
		}
	});

	it('says a dash for a missing or impossible value', () => {
		expect(formatQuantity(null, 'ohms')).toBe('—');
		expect(formatQuantity(Number.NaN, 'ohms')).toBe('—');
	});

	it('round-trips: what it writes reads back to the same figure', () => {
		for (const v of [4700, 2.2e-9, 0.0213, 330e3, 0.3]) {
			for (const kind of ['ohms', 'farads', 'amps', 'seconds'] as const) {
				const words = formatQuantity(v, kind);
				const back = parseQuantity(words, kind);
				if (back.ok) expect(Number(back.value.toPrecision(3))).toBe(Number(v.toPrecision(3)));
			}
		}
	});
});

describe('meaning', () => {
	it('shows the figure beside a field only when the typing is not already that figure', () => {
		expect(meaning('4K7', 'ohms')).toBe('4.7 kΩ');
		expect(meaning('4700', 'ohms')).toBe('4.7 kΩ');
		expect(meaning('4.7 kΩ', 'ohms')).toBeNull();
		expect(meaning('nonsense', 'ohms')).toBeNull();
	});
});

describe('readField', () => {
	it('takes a bare number in the field unit and converts one that names its own', () => {
		expect(readField('20', 'amps', 1e-3)).toEqual({ ok: true, value: 20, explicit: false });
		expect(readField('0.02 A', 'amps', 1e-3)).toEqual({ ok: true, value: 20, explicit: true });
		expect(readField('2n2', 'farads', 1e-12)).toEqual({ ok: true, value: 2200, explicit: true });
		expect(readField('300 ms', 'seconds', 1e-3)).toEqual({ ok: true, value: 300, explicit: true });
	});
});

describe('fieldNumber and fieldMeaning', () => {
	it('read a labelled field as its schema does and say what the typing means', () => {
		expect(fieldNumber('4M7', 'Ω')).toBe(4_700_000);
		expect(fieldNumber('2n2', 'pF')).toBe(2200);
		expect(fieldNumber('20', 'mA')).toBe(20);
		expect(fieldNumber('4,7', 'Ω')).toBeNaN();
		expect(fieldMeaning('4M7', 'Ω')).toBe('4.7 MΩ');
		expect(fieldMeaning('0.02 A', 'mA')).toBe('20 mA');
		expect(fieldMeaning('20', 'mA')).toBeNull();
		expect(fieldMeaning('4.7 MΩ', 'Ω')).toBeNull();
	});
});
