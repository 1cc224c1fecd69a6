import { describeCurve } from './curve';
import type { LevelTable } from './level-table';

// C11 and C23 keywords (ISO/IEC 9899 §6.4.1).
const C_KEYWORDS = new Set(
	(
		'auto break case char const continue default do double else enum extern float for goto if ' +
		'inline int long register restrict return short signed sizeof static struct switch typedef ' +
		'union unsigned void volatile while alignas alignof bool constexpr false nullptr ' +
		'static_assert thread_local true typeof typeof_unqual'
	).split(' ')
);

/** Significant initial characters C guarantees for an internal identifier (C99 §5.2.4.1). */
const C_IDENTIFIER_LENGTH = 63;

/**
 * A C identifier from a display name: lower-case ASCII letters, digits and single underscores,
 * starting with a letter. Keywords and names ending in _t (reserved for types) get a suffix.
 */
export function cIdentifier(name: string): string {
	let id = name
		.normalize('NFKD')
		.replace(/[\u0300-\u036f]/g, '')
		.toLowerCase()
		.replace(/[^a-z0-9]+/g, '_')
		.replace(/^_+|_+$/g, '');
	if (id === '') id = 'level_table';
	if (/^[0-9]/.test(id)) id = `table_${id}`;
	id = id.slice(0, C_IDENTIFIER_LENGTH).replace(/_+$/, '');
	if (C_KEYWORDS.has(id) || id.endsWith('_t'))
		id = `${id.slice(0, C_IDENTIFIER_LENGTH - 6).replace(/_+$/, '')}_table`;
	return id;
}

function commentText(text: string): string {
	return text
		.normalize('NFKD')
		.replace(/[^\x20-\x7e]/g, '')
		.replace(/\*\//g, '* /')
		.trim();
}

function describeTable(table: LevelTable): string {
	return `${table.levels} levels, ${table.bits}-bit PWM (counts 0..${table.maxCount})`;
}

/** A static const array for firmware: uint8_t for 8-bit PWM, uint16_t above. */
export function levelTableToC(table: LevelTable, name: string): string {
	const type = table.bits <= 8 ? 'uint8_t' : 'uint16_t';
	const perLine = table.bits <= 8 ? 16 : 12;
	const width = String(table.maxCount).length;
	const lines: string[] = [];
	for (let i = 0; i < table.counts.length; i += perLine) {
		const chunk = table.counts.slice(i, i + perLine).map((c) => String(c).padStart(width));
		const end = i + perLine >= table.counts.length ? '' : ',';
		lines.push(`\t${chunk.join(', ')}${end}`);
	}
	return [
		'/*',
		` * Level table: ${commentText(name) || 'unnamed'}`,
		` * Curve: ${commentText(describeCurve(table.curve))}`,
		` * ${describeTable(table)}, index = input level`,
		' */',
		'#include <stdint.h>',
		'',
		`static const ${type} ${cIdentifier(name)}[${table.levels}] = {`,
		...lines,
		'};',
		''
	].join('\n');
}

export function levelTableToJson(table: LevelTable, name: string): string {
	return (
		[
			'{',
			`\t"name": ${JSON.stringify(name)},`,
			`\t"curve": ${JSON.stringify(table.curve)},`,
			`\t"description": ${JSON.stringify(describeCurve(table.curve))},`,
			`\t"bits": ${table.bits},`,
			`\t"levels": ${table.levels},`,
			`\t"maxCount": ${table.maxCount},`,
			`\t"counts": [${table.counts.join(', ')}]`,
			'}'
		].join('\n') + '\n'
	);
}

function decimal(value: number): string {
	return value.toFixed(8).replace(/0+$/, '').replace(/\.$/, '');
}

/** CSV with a header row and CRLF line ends (RFC 4180): index, level, duty, count. */
export function levelTableToCsv(table: LevelTable): string {
	const rows = ['index,level,duty,count'];
	const last = table.levels - 1;
	table.counts.forEach((count, i) => {
		rows.push(`${i},${decimal(i / last)},${decimal(count / table.maxCount)},${count}`);
	});
	return rows.join('\r\n') + '\r\n';
}
