// Server side: splits a capture into records, each with the line it ends on, exactly as csv-parse
// reading the whole file with CAPTURE_CSV (and its byte order mark option) would.
//
// Most captures are plain lines of unquoted fields, and those are split here: counting lines while
// splitting is several times quicker than the CSV reader, which would also build an information
// object for every record just to say its line. A line is plain when it has no quote (a comment
// line may), no carriage return other than its own CRLF ending, the same ending as the file's first
// line, and is short enough that it cannot pass the reader's length limit. From the first line that
// is not plain, the rest of the file goes to the CSV reader, its lines counted on from that line.
import { finished } from 'node:stream/promises';
import { once } from 'node:events';
import { CsvError, parse, type Options } from 'csv-parse';

/** Longest line accepted; keeps a stray quote from swallowing the whole file into memory. */
export const MAX_LINE_LENGTH = 4096;

/** The CSV reader's options for a capture: '#' comment lines, blank lines skipped. */
export const CAPTURE_CSV = {
	skip_empty_lines: true,
	relax_column_count: true,
	comment: '#',
	comment_no_infix: true,
	max_record_size: MAX_LINE_LENGTH
} satisfies Options;

/**
 * A plain line at most this long cannot pass MAX_LINE_LENGTH: the reader counts the bytes of the
 * field it is in, and a UTF-16 unit is at most 3 bytes of UTF-8. Longer lines are the reader's.
 */
const PLAIN_LINE = Math.floor(MAX_LINE_LENGTH / 3);

export type RecordSource = AsyncIterable<string | Uint8Array> | Iterable<string | Uint8Array>;

/** Called with each record and the line it ends on; answer false to stop reading. */
export type RecordSink = (fields: string[], line: number) => boolean;

export interface RecordsEnd {
	/** What stopped the CSV reader, if anything did. */
	failure: CsvError | null;
	/** The line the reader's problem is on, when it says. */
	failureLine: number | null;
	/** The line of the last record taken (0 before any). */
	lastLine: number;
}

const CR = 13;
const HASH = 35;

class Splitter {
	/** Lines finished by the plain splitter (the CSV reader's line 1 is the next one). */
	private line = 0;
	private lastLine = 0;
	private stopped = false;
	private ending: '\n' | '\r\n' | null = null;
	private carry = '';
	private started = false;
	private bomChecked = false;
	/** Whether the CSV reader was given the file from its first byte, undecoded. */
	private bytes = false;
	private readonly decoder = new TextDecoder('utf-8', { ignoreBOM: true });
	private parser: ReturnType<typeof parse> | null = null;
	private failure: unknown = null;

	constructor(private readonly sink: RecordSink) {}

	private take(fields: string[], line: number) {
		this.lastLine = line;
		if (!this.sink(fields, line)) this.stopped = true;
	}

	/** Hands the rest of the file to the CSV reader, from the line after the plain ones. */
	private handOver(bytes: boolean) {
		const offset = this.line;
		const p = parse({
			...CAPTURE_CSV,
			// A byte order mark only counts at the very start of the file.
			bom: bytes,
			// The reader keeps to the ending of the file's first line, as a whole-file read would.
			...(this.ending ? { record_delimiter: this.ending } : {}),
			// Records are handled here and never queued as stream output, which keeps memory flat.
			on_record: (record: string[], context) => {
				if (!this.stopped) this.take(record, context.lines + offset);
				return null;
			}
		});
		// Once the sink has stopped reading, what the reader finds further on is not reported.
		p.on('error', (error) => {
			if (!this.stopped) this.failure ??= error;
		});
		p.resume();
		this.parser = p;
		return p;
	}

	/**
	 * Splits the plain lines off the front of text and returns what is left: the start of a line
	 * still to come, or nothing once the rest has gone to the CSV reader (or reading stopped).
	 */
	private plain(text: string, end: boolean): string {
		// A chunk without quotes or carriage returns needs no look at each line for them.
		const clean = text.indexOf('"') === -1 && text.indexOf('\r') === -1;
		let start = 0;
		while (!this.stopped) {
			let nl = text.indexOf('\n', start);
			if (nl === -1) {
				if (!end) {
					if (text.length - start <= PLAIN_LINE) return text.slice(start);
					break;
				}
				if (start >= text.length) return '';
				nl = text.length;
			}
			const ended = nl < text.length;
			let stop = nl;
			if (!clean && ended && nl > start && text.charCodeAt(nl - 1) === CR) stop--;
			const seen = stop < nl ? '\r\n' : '\n';
			if (ended && this.ending !== null && seen !== this.ending) break;
			if (stop - start > PLAIN_LINE && text.charCodeAt(start) !== HASH) break;
			const content = text.slice(start, stop);
			if (!clean) {
				if (content.indexOf('\r') !== -1) break;
				if (content.charCodeAt(0) !== HASH && content.indexOf('"') !== -1) break;
			}
			if (ended) this.ending ??= seen;
			this.line++;
			if (content.length > 0 && content.charCodeAt(0) !== HASH)
				this.take(content.split(','), this.line);
			start = nl + 1;
		}
		if (this.stopped) return '';
		const rest = text.slice(start);
		const p = this.handOver(false);
		if (rest) this.write(p, rest);
		return '';
	}

	private pending: Promise<void> | null = null;

	private write(p: ReturnType<typeof parse>, chunk: string | Uint8Array) {
		if (!p.write(chunk)) this.pending = once(p, 'drain').then(() => undefined);
	}

	private async feed(chunk: string | Uint8Array) {
		if (!this.started) {
			if (chunk.length === 0) return;
			this.started = true;
			// A UTF-16 file (its byte order mark first) is the reader's whole: it changes encoding.
			if (typeof chunk !== 'string' && (chunk[0] === 0xff || chunk[0] === 0xfe)) {
				this.bytes = true;
				this.write(this.handOver(true), chunk);
				return this.drain();
			}
		}
		if (this.bytes && this.parser) {
			this.write(this.parser, chunk);
			return this.drain();
		}
		let text = typeof chunk === 'string' ? chunk : this.decoder.decode(chunk, { stream: true });
		if (this.parser) {
			// Decoded here still: the decoder may hold the first bytes of a character.
			if (text) this.write(this.parser, text);
			return this.drain();
		}
		if (!this.bomChecked && text.length > 0) {
			this.bomChecked = true;
			if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
		}
		this.carry = this.plain(this.carry + text, false);
		return this.drain();
	}

	private async drain() {
		const waiting = this.pending;
		this.pending = null;
		if (waiting) await waiting;
	}

	async run(source: RecordSource): Promise<RecordsEnd> {
		try {
			for await (const chunk of source) {
				if (this.stopped || this.failure) break;
				await this.feed(chunk);
			}
			if (!this.stopped && !this.failure) {
				const tail = this.bytes ? '' : this.decoder.decode();
				if (this.parser) {
					if (tail) this.write(this.parser, tail);
				} else {
					this.carry = this.plain(this.carry + tail, true);
				}
				await this.drain();
				const p = this.parser as ReturnType<typeof parse> | null;
				if (p && !this.stopped && !this.failure) {
					p.end();
					await finished(p);
				}
			}
		} catch (error) {
			if (!(this.stopped && error instanceof CsvError)) this.failure ??= error;
		} finally {
			(this.parser as ReturnType<typeof parse> | null)?.destroy();
		}
		const failure = this.failure;
		if (failure === null) return { failure: null, failureLine: null, lastLine: this.lastLine };
		if (!(failure instanceof CsvError)) throw failure;
		// The reader only notices an unclosed quote at the end of the file; the quote itself opened
		// on the first line after the last complete record.
		const offset = this.line;
		const failureLine =
			failure.code === 'CSV_QUOTE_NOT_CLOSED'
				? this.lastLine + 1
				: typeof failure.lines === 'number'
					? failure.lines + offset
					: null;
		return { failure, failureLine, lastLine: this.lastLine };
	}
}

/** Reads every record of a capture, in order, with its line; see the top of this module. */
export function readRecords(source: RecordSource, sink: RecordSink): Promise<RecordsEnd> {
	return new Splitter(sink).run(source);
}
