// One way to read and write the quantities people type and read: resistances, capacitances, currents,
// times, rates, percentages and raw counts.
//
// Reading accepts what the trade writes: plain and exponent numbers (2.2e6), SI prefixes with or without
// the unit and with or without a space (4.7M, 4.7 MΩ, 330k, 100n, 10 µF), and the letter-and-digit code
// of IEC 60062 where the prefix letter stands in for the decimal point (4K7, 4M7, R47, 2n2). Writing
// rounds to significant digits suited to the kind of quantity; stored values keep full precision.

export type QuantityKind =
	| 'ohms'
	| 'farads'
	| 'amps'
	| 'volts'
	| 'watts'
	| 'hertz'
	| 'seconds'
	| 'percent'
	| 'count'
	| 'plain';

/** SI prefixes (SI Brochure, 9th edition, table 7), as multipliers. */
const PREFIX: Record<string, number> = {
	p: 1e-12,
	n: 1e-9,
	µ: 1e-6,
	m: 1e-3,
	'': 1,
	k: 1e3,
	M: 1e6,
	G: 1e9
};

interface KindRule {
	/** The unit's symbol as written after a number ('' for none). */
	symbol: string;
	/** Other ways people write the unit, lower case. */
	aliases: string[];
	/** The prefixes that make sense for this kind of quantity. */
	prefixes: string[];
	/** Which letter-and-digit code of IEC 60062 applies, if any. */
	code?: 'resistance' | 'capacitance';
	/** Significant digits when written for people. */
	digits: number;
	/** The word for a message: "a resistance". */
	noun: string;
}

const KINDS: Record<QuantityKind, KindRule> = {
	ohms: {
		symbol: 'Ω',
		aliases: ['ohm', 'ohms', 'Ω', 'ω'],
		prefixes: ['m', '', 'k', 'M', 'G'],
		code: 'resistance',
		digits: 3,
		noun: 'a resistance'
	},
	farads: {
		symbol: 'F',
		aliases: ['f', 'farad', 'farads'],
		prefixes: ['p', 'n', 'µ', 'm', ''],
		code: 'capacitance',
		digits: 3,
		noun: 'a capacitance'
	},
	amps: {
		symbol: 'A',
		aliases: ['a', 'amp', 'amps'],
		prefixes: ['µ', 'm', ''],
		digits: 3,
		noun: 'a current'
	},
	volts: {
		symbol: 'V',
		aliases: ['v', 'volt', 'volts'],
		prefixes: ['m', '', 'k'],
		digits: 3,
		noun: 'a voltage'
	},
	watts: {
		symbol: 'W',
		aliases: ['w', 'watt', 'watts'],
		prefixes: ['m', '', 'k'],
		digits: 3,
		noun: 'a power'
	},
	hertz: {
		symbol: 'Hz',
		aliases: ['hz'],
		prefixes: ['', 'k', 'M', 'G'],
		digits: 3,
		noun: 'a rate'
	},
	seconds: {
		symbol: 's',
		aliases: ['s', 'sec', 'secs', 'second', 'seconds'],
		prefixes: ['µ', 'm', ''],
		digits: 3,
		noun: 'a time'
	},
	percent: { symbol: '%', aliases: ['%'], prefixes: [''], digits: 3, noun: 'a percentage' },
	count: { symbol: '', aliases: [], prefixes: [''], digits: 0, noun: 'a count' },
	plain: { symbol: '', aliases: [], prefixes: [''], digits: 4, noun: 'a number' }
};

/** `explicit`: the typing named its own prefix, unit or code, rather than being a bare number. */
export type QuantityResult =
	{ ok: true; value: number; explicit: boolean } | { ok: false; message: string };

const NUMBER = String.raw`[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:e[+-]?\d+)?`;
const SI = new RegExp(`^(${NUMBER})\\s*(.*)$`, 'i');
/** IEC 60062 resistance code: digits, one of L R K M G T in place of the decimal point, digits. */
const RESISTANCE_CODE = /^(\d*)([LRKMGT])(\d*)$/i;
const RESISTANCE_LETTER: Record<string, number> = {
	L: 1e-3,
	R: 1,
	K: 1e3,
	M: 1e6,
	G: 1e9,
	T: 1e12
};
/** IEC 60062 capacitance code: p n µ m F in place of the decimal point (lower case, F upper). */
const CAPACITANCE_CODE = /^(\d*)([pnµmF])(\d*)$/;
const CAPACITANCE_LETTER: Record<string, number> = { p: 1e-12, n: 1e-9, µ: 1e-6, m: 1e-3, F: 1 };

/** Spaces of every width become one plain space; both micro characters become µ. */
function tidy(text: string): string {
	return text
		.replace(/[\s\u00a0\u2009\u202f]+/g, ' ')
		.replace(/[μ]/g, 'µ')
		.trim();
}

function fromCode(text: string, kind: QuantityKind): number | null {
	const rule = KINDS[kind];
	if (rule.code === 'resistance') {
		const m = RESISTANCE_CODE.exec(text);
		if (!m || (!m[1] && !m[3])) return null;
		// Upper case per IEC 60062; a lower-case k is read as kilo too (it is the SI prefix), but a
		// lower-case m would be milli, never mega, so only R, K and L are read in either case.
		const letter = m[2];
		if (letter !== letter.toUpperCase() && !'rkl'.includes(letter)) return null;
		return Number(`${m[1] || '0'}.${m[3] || '0'}`) * RESISTANCE_LETTER[letter.toUpperCase()];
	}
	if (rule.code === 'capacitance') {
		const m = CAPACITANCE_CODE.exec(text.replace(/(\d)u(\d|$)/, '$1µ$2'));
		if (!m || (!m[1] && !m[3])) return null;
		return Number(`${m[1] || '0'}.${m[3] || '0'}`) * CAPACITANCE_LETTER[m[2]];
	}
	return null;
}

/** Splits "kΩ", "k", "Ω", "kohm", "uF" into a prefix and whether the unit (if any) is this kind's. */
function splitUnit(rest: string, rule: KindRule): { prefix: string } | null {
	const r = rest.trim();
	if (r === '') return { prefix: '' };
	const candidates = rule.prefixes.flatMap((p) => {
		const spellings = p === 'µ' ? ['µ', 'u'] : p === 'k' ? ['k', 'K'] : [p];
		return spellings.map((s) => ({ prefix: p, s }));
	});
	// A whole unit or alias, with or without a prefix; longest spelling first so "ms" is milli-seconds.
	for (const alias of [rule.symbol, ...rule.aliases].filter(Boolean)) {
		for (const { prefix, s } of candidates) {
			const spelled = `${s}${alias}`;
			if (r === spelled || r.toLowerCase() === spelled.toLowerCase()) {
				// Case matters for the prefix: m is milli and M is mega.
				if (r.slice(0, s.length) !== s) continue;
				return { prefix };
			}
		}
	}
	// A prefix alone, the unit left implicit ("330k", "100n", "20m"), but never for times, where
	// "3m" could as well mean minutes.
	if (rule.symbol !== 's')
		for (const { prefix, s } of candidates) if (s && r === s) return { prefix };
	return null;
}

/** What a typed quantity means, or a message saying why it cannot be read. */
export function parseQuantity(input: string, kind: QuantityKind = 'plain'): QuantityResult {
	const rule = KINDS[kind];
	let text = tidy(input);
	if (text === '') return { ok: false, message: `Give ${rule.noun}.` };
	// Thousands separators ("12,000"), but never a decimal comma, which would be read wrongly.
	if (/^[+-]?\d{1,3}(,\d{3})+(\.\d+)?(?!\d)/.test(text)) text = text.replace(/,/g, '');
	if (text.includes(',')) return { ok: false, message: 'Use a point for decimals (4.7, not 4,7).' };

	const coded = fromCode(text, kind);
	if (coded !== null) return { ok: true, value: Number(coded.toPrecision(15)), explicit: true };

	const m = SI.exec(text);
	if (!m) return { ok: false, message: `“${input.trim()}” is not ${rule.noun} we can read.` };
	const n = Number(m[1]);
	const unit = splitUnit(m[2], rule);
	if (!unit || !Number.isFinite(n)) {
		const example = EXAMPLES[kind];
		return {
			ok: false,
			message: `“${input.trim()}” is not ${rule.noun} we can read${example ? `: write it like ${example}` : ''}.`
		};
	}
	const value = n * PREFIX[unit.prefix];
	// Undo the binary rounding that multiplying by 10^-n brings (4.7 × 1e-9 → 4.7e-9 exactly as typed).
	return { ok: true, value: Number(value.toPrecision(15)), explicit: m[2].trim() !== '' };
}

const EXAMPLES: Partial<Record<QuantityKind, string>> = {
	ohms: '4.7k, 4K7 or 4700',
	farads: '100n, 2n2 or 10 µF',
	amps: '20 mA or 0.02',
	volts: '3.3 or 3300 mV',
	watts: '0.25 or 250 mW',
	hertz: '2.5 or 2.5 Hz',
	seconds: '0.3 or 300 ms',
	percent: '15 or 15 %',
	count: '850',
	plain: '12.5'
};

const byDigits = new Map<number, Intl.NumberFormat>();
/** Rounds to significant digits, grouped, never with an exponent. */
function significant(value: number, digits: number): string {
	let f = byDigits.get(digits);
	if (!f) {
		f = new Intl.NumberFormat('en-GB', { maximumSignificantDigits: digits });
		byDigits.set(digits, f);
	}
	return f.format(value);
}

/** A quantity written for people: "4.7 kΩ", "100 nF", "20 mA", "300 ms", "12.5 %", "828". */
export function formatQuantity(
	value: number | null | undefined,
	kind: QuantityKind = 'plain',
	opts: { digits?: number } = {}
): string {
	if (value === null || value === undefined || !Number.isFinite(value)) return '—';
	const rule = KINDS[kind];
	if (kind === 'count') {
		// Raw readings: whole counts, grouped; a fraction only where the count is small.
		const abs = Math.abs(value);
		return abs >= 100 || Number.isInteger(value)
			? new Intl.NumberFormat('en-GB', { maximumFractionDigits: 0 }).format(value)
			: significant(value, 3);
	}
	const digits = opts.digits ?? rule.digits;
	if (kind === 'percent' || kind === 'plain') {
		const words = significant(value, Math.abs(value) >= 10 ** digits ? 21 : digits);
		return kind === 'percent' ? `${words} %` : words;
	}
	// Engineering notation over the prefixes this kind uses.
	const abs = Math.abs(value);
	const ordered = rule.prefixes.map((p) => ({ p, f: PREFIX[p] })).sort((a, b) => a.f - b.f);
	let chosen = ordered[0];
	for (const step of ordered) if (abs >= step.f * (1 - 1e-12)) chosen = step;
	if (abs === 0) chosen = { p: '', f: 1 };
	let scaled = value / chosen.f;
	// Rounding can carry into the next prefix (999.7 kΩ → 1 MΩ).
	if (Math.abs(Number(scaled.toPrecision(digits))) >= 1000) {
		const next = ordered[ordered.indexOf(chosen) + 1];
		if (next) {
			chosen = next;
			scaled = value / chosen.f;
		}
	}
	return `${significant(scaled, digits)} ${chosen.p}${rule.symbol}`;
}

/** The figure a typed value means, for showing beside the field: null when it reads as itself. */
export function meaning(input: string, kind: QuantityKind): string | null {
	const r = parseQuantity(input, kind);
	if (!r.ok) return null;
	const written = formatQuantity(r.value, kind);
	const plain = tidy(input).replace(/\s/g, '');
	return written.replace(/\s/g, '') === plain ? null : written;
}

/**
 * A field's figure in the field's own unit. A bare number is taken as already in that unit; a value
 * with its own prefix or unit is converted: in a field kept in milliamps (`scale` 1e-3), "20" is
 * 20 mA and "0.02 A" is 20 mA too.
 */
export function readField(input: string, kind: QuantityKind, scale = 1): QuantityResult {
	const r = parseQuantity(input, kind);
	if (!r.ok || !r.explicit || scale === 1) return r;
	return { ok: true, value: Number((r.value / scale).toPrecision(15)), explicit: true };
}

/** A plain figure for people, to `digits` significant digits, grouped: 827.4853 → "827.5". */
export function figure(value: number | null | undefined, digits = 4): string {
	return formatQuantity(value, 'plain', { digits });
}

/** How to read a field from the unit it is labelled with: 'mA' is a current kept in milliamps. */
export function unitKind(unit: string | undefined): { kind: QuantityKind; scale: number } {
	switch (unit) {
		case 'Ω':
			return { kind: 'ohms', scale: 1 };
		case 'pF':
			return { kind: 'farads', scale: 1e-12 };
		case 'A':
			return { kind: 'amps', scale: 1 };
		case 'mA':
			return { kind: 'amps', scale: 1e-3 };
		case 'V':
			return { kind: 'volts', scale: 1 };
		case 'Hz':
			return { kind: 'hertz', scale: 1 };
		case 's':
			return { kind: 'seconds', scale: 1 };
		case 'ms':
			return { kind: 'seconds', scale: 1e-3 };
		case '%':
			return { kind: 'percent', scale: 1 };
		default:
			return { kind: 'plain', scale: 1 };
	}
}

/**
 * A field's typing as the number the server will store, for live maths on the page: the same
 * reading the form's schema does, so what is previewed is what is saved. NaN when unreadable.
 */
export function fieldNumber(text: string | undefined, unit: string | undefined): number {
	if (text === undefined || text.trim() === '') return NaN;
	const { kind, scale } = unitKind(unit);
	const r = readField(text, kind, scale);
	return r.ok ? r.value : NaN;
}

/** What a field's typing means in the field's own unit, when that is not already plain. */
export function fieldMeaning(text: string | undefined, unit: string | undefined): string | null {
	if (!text) return null;
	const { kind, scale } = unitKind(unit);
	const r = readField(text, kind, scale);
	if (!r.ok || !r.explicit) return null;
	const words = formatQuantity(r.value * scale, kind, { digits: 4 });
	return words.replace(/\s/g, '') === text.replace(/\s/g, '') ? null : words;
}
