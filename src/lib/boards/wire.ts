// The boards' wire format, the same over MQTT and HTTPS. Each reading is
//   sensor  the sensor's id, its name, or its short name (lower case, spaces as '-')
//   seq     the board's sequence number (or board time in ms): a whole number that only grows
//   reading the measured value, a finite number
//   label   optional, up to 64 characters
// as JSON — { "readings": [{ "sensor": "lid", "seq": 41, "reading": 512, "label": "boot" }] }, or a
// bare array of the same — or as text, one reading per line: `lid 41 512 boot`.
// Over MQTT the key travels in the message: "key" in the JSON object, or a first line `key <token>`.
// Pure: no database, shared by the HTTP route, the MQTT listener and the tests.

export const MAX_BODY_BYTES = 64 * 1024;
export const MAX_BATCH = 1000;
export const MAX_LABEL = 64;

export interface WireReading {
	sensor: string;
	seq: number;
	reading: number;
	label: string | null;
}

export type Parsed =
	| { ok: true; key: string | null; readings: WireReading[] }
	| { ok: false; message: string; key?: string | null };

/** The short name of a sensor: 'Lid button' → 'lid-button'. */
export function shortName(name: string): string {
	return name
		.toLowerCase()
		.replace(/[^\p{L}\p{N}]+/gu, '-')
		.replace(/^-|-$/g, '');
}

// Control characters (including NUL, which PostgreSQL cannot store) are refused in any field.
// eslint-disable-next-line no-control-regex
const CONTROL = /[\u0000-\u001f\u007f]/;

function where(i: number, lines: boolean) {
	return lines ? `Line ${i + 1}` : `Reading ${i + 1}`;
}

function check(raw: unknown, i: number, lines: boolean): WireReading | string {
	const at = where(i, lines);
	if (typeof raw !== 'object' || raw === null || Array.isArray(raw))
		return `${at} is not a reading: send an object with sensor, seq and reading.`;
	const r = raw as Record<string, unknown>;
	const sensor = typeof r.sensor === 'string' ? r.sensor.trim() : '';
	if (!sensor || sensor.length > 100 || CONTROL.test(sensor))
		return `${at} has no sensor: give the sensor's id or name.`;
	const seq = typeof r.seq === 'string' && /^\d+$/.test(r.seq) ? Number(r.seq) : r.seq;
	if (typeof seq !== 'number' || !Number.isSafeInteger(seq) || seq < 0)
		return `${at} needs a sequence number: a whole number from 0 up.`;
	const reading =
		typeof r.reading === 'string' && r.reading.trim() !== '' ? Number(r.reading) : r.reading;
	if (typeof reading !== 'number' || !Number.isFinite(reading))
		return `${at} has no reading: it must be a number.`;
	let label: string | null = null;
	if (r.label !== undefined && r.label !== null) {
		if (typeof r.label !== 'string' || r.label.length > MAX_LABEL || CONTROL.test(r.label))
			return `${at} has a label that is not text of up to ${MAX_LABEL} characters.`;
		label = r.label.trim() || null;
	}
	return { sensor, seq, reading, label };
}

function checkAll(items: unknown[], key: string | null, lines: boolean): Parsed {
	if (items.length === 0) return { ok: false, message: 'There are no readings in this message.' };
	if (items.length > MAX_BATCH)
		return {
			ok: false,
			message: `At most ${MAX_BATCH} readings in one message; this one has ${items.length}.`
		};
	const readings: WireReading[] = [];
	for (const [i, item] of items.entries()) {
		const r = check(item, i, lines);
		if (typeof r === 'string') return { ok: false, message: r };
		readings.push(r);
	}
	return { ok: true, key, readings };
}

/** Text lines: `sensor seq reading [label]`; blank lines and lines starting with # are skipped. */
export function parseLines(text: string): Parsed {
	let key: string | null = null;
	const items: unknown[] = [];
	const lines = text.split(/\r?\n/);
	for (const [i, line] of lines.entries()) {
		const t = line.trim();
		if (!t || t.startsWith('#')) continue;
		const parts = t.split(/\s+/);
		if (i === 0 && parts[0] === 'key' && parts.length === 2) {
			key = parts[1];
			continue;
		}
		if (parts.length < 3)
			return {
				ok: false,
				message: `Line ${i + 1} should be “sensor seq reading [label]”, separated by spaces.`
			};
		const [sensor, seq, reading, ...label] = parts;
		items.push({ sensor, seq, reading, label: label.length ? label.join(' ') : undefined });
	}
	const r = checkAll(items, key, false);
	return r.ok ? r : { ...r, key };
}

export function parseJson(text: string): Parsed {
	let body: unknown;
	try {
		body = JSON.parse(text);
	} catch {
		return { ok: false, message: 'This is not valid JSON.' };
	}
	if (Array.isArray(body)) return checkAll(body, null, false);
	const b = (typeof body === 'object' && body !== null ? body : {}) as {
		readings?: unknown;
		key?: unknown;
	};
	const key = typeof b.key === 'string' ? b.key : null;
	if (!Array.isArray(b.readings))
		return {
			ok: false,
			key,
			message: 'Send an object with a "readings" list, or a list of readings.'
		};
	const r = checkAll(b.readings, key, false);
	return r.ok ? r : { ...r, key };
}

/** JSON when it looks like JSON (or says so), lines otherwise. */
export function parseReadings(text: string, contentType = ''): Parsed {
	if (text.length === 0) return { ok: false, message: 'This message is empty.' };
	if (CONTROL.test(text.replace(/[\r\n\t]/g, '')))
		return { ok: false, message: 'This message contains characters that are not text.' };
	const json = contentType.includes('json') || /^\s*[[{]/.test(text);
	return json ? parseJson(text) : parseLines(text);
}
