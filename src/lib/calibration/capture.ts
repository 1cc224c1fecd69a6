// Server side: reads a capture as a stream. Import from '$lib/calibration/capture'; it is kept out
// of the index because the CSV parser needs Node streams.
import type { CsvError } from 'csv-parse';
import { isValid, parseISO } from 'date-fns';
import {
	CaptureStats,
	type CaptureLabel,
	type CaptureRow,
	type CaptureStatsOptions,
	type CaptureSummary
} from './stats';
import { MAX_LINE_LENGTH, readRecords, type RecordSource } from './records';

export { MAX_LINE_LENGTH };
export const DEFAULT_MAX_ERRORS = 20;

export type CaptureSource = RecordSource;

export interface CaptureError {
	/** 1-based line in the file; null for problems with the file as a whole. */
	line: number | null;
	message: string;
}

export interface CaptureReadOptions extends CaptureStatsOptions {
	/** Reading stops once this many bad lines have been found. */
	maxErrors?: number;
	/** Called for every good row, with its line number. */
	onRow?: (row: CaptureRow, line: number) => void;
}

export interface CaptureColumns {
	header: boolean;
	time: boolean;
}

export interface CaptureResult {
	ok: boolean;
	errors: CaptureError[];
	/** True when reading stopped at maxErrors or at a line the CSV reader could not get past. */
	stoppedEarly: boolean;
	columns: CaptureColumns | null;
	summary: CaptureSummary;
}

const TIME_SECONDS = ['time', 't', 'timestamp', 'seconds', 'secs', 'sec', 's', 'time_s', 'elapsed'];
const TIME_MILLISECONDS = ['ms', 'millis', 'milliseconds', 'time_ms', 't_ms', 'elapsed_ms'];
const READING = ['reading', 'value', 'val', 'count', 'counts', 'raw', 'sample'];
const LABEL = ['label', 'state', 'class', 'tag'];
const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i;

const isDigit = (c: number) => c >= 48 && c <= 57;
const POWERS_OF_TEN = Array.from({ length: 16 }, (_, k) => 10 ** k);

/**
 * What a field means as a number when it matches NUMBER, else NaN: the same as testing NUMBER and
 * calling Number(), read by hand because it runs for every field of every row. Up to 15 digits
 * without an exponent, digits / 10^decimals is exact: both are whole numbers a double holds
 * exactly, and a division rounds correctly, as Number() does. Anything longer goes to Number().
 */
export function plainNumber(text: string): number {
	const n = text.length;
	let i = 0;
	let c = text.charCodeAt(0);
	const negative = c === 45;
	if (c === 43 || c === 45) c = text.charCodeAt(++i);
	let digits = 0;
	let whole = 0;
	while (isDigit(c)) {
		digits = digits * 10 + (c - 48);
		whole++;
		c = text.charCodeAt(++i);
	}
	let decimals = 0;
	if (c === 46) {
		c = text.charCodeAt(++i);
		while (isDigit(c)) {
			digits = digits * 10 + (c - 48);
			decimals++;
			c = text.charCodeAt(++i);
		}
	}
	if (whole === 0 && decimals === 0) return NaN;
	if (c === 101 || c === 69) {
		c = text.charCodeAt(++i);
		if (c === 43 || c === 45) c = text.charCodeAt(++i);
		let exponent = 0;
		while (isDigit(c)) {
			exponent++;
			c = text.charCodeAt(++i);
		}
		return exponent > 0 && i === n ? Number(text) : NaN;
	}
	if (i !== n) return NaN;
	if (whole + decimals > 15) return Number(text);
	const value = digits / POWERS_OF_TEN[decimals];
	return negative ? -value : value;
}

type Layout = {
	width: number;
	time: number | null;
	timeScale: number;
	reading: number;
	label: number;
};

function columnName(field: string): string {
	return field
		.trim()
		.toLowerCase()
		.replace(/[^a-z0-9]+/g, '_')
		.replace(/^_+|_+$/g, '');
}

function quoted(value: string): string {
	return `'${value.length > 24 ? value.slice(0, 24) + '…' : value}'`;
}

type Outcome =
	| { kind: 'header' }
	| { kind: 'row'; row: CaptureRow }
	| { kind: 'error'; message: string; fatal: boolean };

/** Turns CSV records into rows, working out the columns from the first record. */
class RecordReader {
	layout: Layout | null = null;
	header = false;

	read(fields: string[], _line: number): Outcome {
		if (this.layout === null) {
			const names = fields.map(columnName);
			const known = [...TIME_SECONDS, ...TIME_MILLISECONDS, ...READING, ...LABEL];
			if (names.some((n) => known.includes(n))) return this.readHeader(names);
			if (fields.length === 2)
				this.layout = { width: 2, time: null, timeScale: 1, reading: 0, label: 1 };
			else if (fields.length === 3)
				this.layout = { width: 3, time: 0, timeScale: 1, reading: 1, label: 2 };
			else
				return {
					kind: 'error',
					fatal: true,
					message: `expected a header or 2 columns (reading, label) or 3 (time, reading, label), found ${fields.length}`
				};
		}
		return this.readRow(fields, this.layout);
	}

	private readHeader(names: string[]): Outcome {
		const find = (aliases: string[]) => names.findIndex((n) => aliases.includes(n));
		const seconds = find(TIME_SECONDS);
		const milliseconds = find(TIME_MILLISECONDS);
		const reading = find(READING);
		const label = find(LABEL);
		const missing: string[] = [];
		if (reading === -1) missing.push('reading column (reading or value)');
		if (label === -1) missing.push('label column (label or state)');
		if (missing.length > 0)
			return { kind: 'error', fatal: true, message: `header has no ${missing.join(' and no ')}` };
		const time = seconds !== -1 ? seconds : milliseconds !== -1 ? milliseconds : null;
		this.header = true;
		this.layout = {
			width: names.length,
			time,
			timeScale: seconds === -1 && milliseconds !== -1 ? 0.001 : 1,
			reading,
			label
		};
		return { kind: 'header' };
	}

	/** A good row the quick way; anything unusual is read again by slowRow for its messages. */
	private readRow(fields: string[], layout: Layout): Outcome {
		if (fields.length === layout.width) {
			let label = fields[layout.label].trim();
			if (label !== 'idle' && label !== 'present') label = label.toLowerCase();
			const reading = plainNumber(fields[layout.reading].trim());
			// NaN (not a number) and overflow both fail this; slowRow says which.
			if ((label === 'idle' || label === 'present') && Number.isFinite(reading)) {
				if (layout.time === null) return { kind: 'row', row: { reading, label } };
				const time = plainNumber(fields[layout.time].trim());
				if (!Number.isNaN(time))
					return { kind: 'row', row: { reading, label, time: time * layout.timeScale } };
			}
		}
		return this.slowRow(fields, layout);
	}

	private slowRow(fields: string[], layout: Layout): Outcome {
		if (fields.length !== layout.width)
			return {
				kind: 'error',
				fatal: false,
				message: `expected ${layout.width} columns, found ${fields.length}`
			};
		const problems: string[] = [];
		const readingText = fields[layout.reading].trim();
		let reading = NaN;
		if (readingText === '') problems.push('reading is empty');
		else if (!NUMBER.test(readingText))
			problems.push(`reading ${quoted(readingText)} is not a number`);
		else reading = Number(readingText);

		let time: number | undefined;
		if (layout.time !== null) {
			const timeText = fields[layout.time].trim();
			if (timeText === '') problems.push('time is empty');
			else if (NUMBER.test(timeText)) time = Number(timeText) * layout.timeScale;
			else {
				const date = parseISO(timeText);
				if (isValid(date)) time = date.getTime() / 1000;
				else
					problems.push(
						`time ${quoted(timeText)} is not a number of seconds or an ISO 8601 date-time`
					);
			}
		}

		const labelText = fields[layout.label].trim();
		const labelKey = labelText.toLowerCase();
		if (labelKey !== 'idle' && labelKey !== 'present')
			problems.push(
				labelText === ''
					? 'label is empty; it must be idle or present'
					: `label ${quoted(labelText)} must be idle or present`
			);
		if (!Number.isFinite(reading) && problems.length === 0)
			problems.push(`reading ${quoted(readingText)} is out of range`);

		if (problems.length > 0) return { kind: 'error', fatal: false, message: problems.join('; ') };
		const row: CaptureRow = { reading, label: labelKey as CaptureLabel };
		if (time !== undefined) row.time = time;
		return { kind: 'row', row };
	}
}

function csvProblem(error: CsvError): string {
	switch (error.code) {
		case 'CSV_QUOTE_NOT_CLOSED':
			return 'a quote opened on or after this line is never closed';
		case 'CSV_INVALID_CLOSING_QUOTE':
		case 'CSV_NON_TRIMABLE_CHAR_AFTER_CLOSING_QUOTE':
			return 'text follows a closing quote';
		case 'INVALID_OPENING_QUOTE':
			return 'a quote opens in the middle of a field';
		case 'CSV_MAX_RECORD_SIZE':
			return `the line is longer than ${MAX_LINE_LENGTH} characters`;
		default:
			return error.message;
	}
}

/**
 * Reads a capture CSV as a stream, row by row, into bounded-memory statistics. The header is
 * optional (time, reading, label; aliases such as value accepted); without one, 2 columns are
 * reading,label and 3 are time,reading,label. Time is in seconds (a column named ms or time_ms
 * is milliseconds) or an ISO 8601 date-time. Bad lines are reported with their line number;
 * reading stops after maxErrors of them.
 */
export async function readCapture(
	source: CaptureSource,
	options: CaptureReadOptions = {}
): Promise<CaptureResult> {
	const maxErrors = options.maxErrors ?? DEFAULT_MAX_ERRORS;
	const stats = new CaptureStats(options);
	const reader = new RecordReader();
	const errors: CaptureError[] = [];
	let stopped = false;
	let records = 0;

	const ended = await readRecords(source, (record, line) => {
		records++;
		const outcome = reader.read(record, line);
		if (outcome.kind === 'row') {
			stats.add(outcome.row);
			options.onRow?.(outcome.row, line);
		} else if (outcome.kind === 'error') {
			errors.push({ line, message: `line ${line}: ${outcome.message}` });
			if (outcome.fatal || errors.length >= maxErrors) stopped = true;
		}
		return !stopped;
	});

	if (ended.failure) {
		const line = ended.failureLine;
		const where = line === null ? '' : `line ${line}: `;
		errors.push({ line, message: `${where}${csvProblem(ended.failure)}; reading stopped here` });
		stopped = true;
	}

	const summary = stats.summary();
	if (!stopped) {
		if (records === 0) errors.push({ line: null, message: 'the capture is empty' });
		else {
			if (summary.idle.count === 0)
				errors.push({ line: null, message: 'the capture has no idle readings' });
			if (summary.present.count === 0)
				errors.push({ line: null, message: 'the capture has no present readings' });
		}
	}
	const columns = reader.layout
		? { header: reader.header, time: reader.layout.time !== null }
		: null;
	return { ok: errors.length === 0, errors, stoppedEarly: stopped, columns, summary };
}
