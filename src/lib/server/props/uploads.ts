import { createHash, randomUUID } from 'node:crypto';
import { createReadStream, createWriteStream } from 'node:fs';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { once } from 'node:events';
import { fileTypeFromBuffer } from 'file-type';
import { and, eq } from 'drizzle-orm';
import { readCapture } from '$lib/calibration/capture';
import { CalibrationInputError, calibrate, captureHistograms } from '$lib/calibration';
import type { Db } from '$lib/server/db/client';
import { captures, propFiles, props, sensors } from '$lib/server/db/schema';
import type { ObjectStore } from '$lib/server/objects';
import { discardObjects } from '$lib/server/object-cleanup';

export const CAPTURE_MAX_BYTES = 50 * 1024 * 1024;
export const IMAGE_MAX_BYTES = 10 * 1024 * 1024;
export const PDF_MAX_BYTES = 20 * 1024 * 1024;
export const IMAGE_TYPES = ['image/png', 'image/jpeg', 'image/webp'];

export type UploadRefusal = { ok: false; status: number; message: string; line?: number | null };

const mb = (bytes: number) => `${bytes / 1024 / 1024} MB`;

interface Spooled {
	dir: string;
	path: string;
	size: number;
	sha256: string;
	head: Uint8Array;
}

/**
 * Writes a request body to a temporary file chunk by chunk, hashing as it goes, and stops as soon
 * as it passes maxBytes. Nothing is held in memory beyond one chunk and the first 4 kB.
 */
async function spool(
	body: ReadableStream<Uint8Array> | null,
	maxBytes: number
): Promise<Spooled | UploadRefusal> {
	if (!body) return { ok: false, status: 400, message: 'The upload was empty.' };
	const dir = await mkdtemp(join(tmpdir(), 'gloaming-upload-'));
	const path = join(dir, 'body');
	const out = createWriteStream(path);
	const hash = createHash('sha256');
	const headParts: Uint8Array[] = [];
	let headSize = 0;
	let size = 0;
	const reader = body.getReader();
	try {
		for (;;) {
			const { done, value } = await reader.read();
			if (done) break;
			size += value.byteLength;
			if (size > maxBytes) {
				await reader.cancel().catch(() => {});
				out.destroy();
				await rm(dir, { recursive: true, force: true });
				return { ok: false, status: 413, message: `The file is larger than ${mb(maxBytes)}.` };
			}
			hash.update(value);
			if (headSize < 4100) {
				headParts.push(value.slice(0, 4100 - headSize));
				headSize += Math.min(value.byteLength, 4100 - headSize);
			}
			if (!out.write(value)) await once(out, 'drain');
		}
		out.end();
		await once(out, 'close');
	} catch {
		out.destroy();
		await rm(dir, { recursive: true, force: true });
		return { ok: false, status: 400, message: 'The upload was interrupted; try again.' };
	}
	if (size === 0) {
		await rm(dir, { recursive: true, force: true });
		return { ok: false, status: 400, message: 'The file is empty.' };
	}
	const head = new Uint8Array(headSize);
	let at = 0;
	for (const p of headParts) {
		head.set(p, at);
		at += p.byteLength;
	}
	return { dir, path, size, sha256: hash.digest('hex'), head };
}

function tooLongByHeader(request: Request, maxBytes: number): UploadRefusal | null {
	const declared = Number(request.headers.get('content-length'));
	return Number.isFinite(declared) && declared > maxBytes
		? { ok: false, status: 413, message: `The file is larger than ${mb(maxBytes)}.` }
		: null;
}

export function cleanFilename(name: string | null, fallback: string): string {
	const clean = (name ?? '')
		.replace(/[^\w.\- ()]+/g, '_')
		.trim()
		.slice(0, 120);
	return clean || fallback;
}

/** The capture's summary as stored: the statistics without their samples, histograms, calibration. */
export type StoredCaptureSummary = {
	idle: { count: number; mean: number; sigma: number; min: number; max: number };
	present: { count: number; mean: number; sigma: number; min: number; max: number };
	timed: boolean;
	updateRateHz: number | null;
	driftPerMinute: number | null;
	/** Absent on captures stored before the drift's standard error was kept. */
	driftStandardErrorPerMinute?: number | null;
	histograms: ReturnType<typeof captureHistograms>;
	calibration: ReturnType<typeof calibrate> | null;
	calibrationProblem: string | null;
};

/**
 * Receives a capture CSV: spools it, reads it as a stream, and stores it only when every line is
 * good. A bad file is refused with the first bad line's number, and nothing is kept.
 */
export async function ingestCapture(opts: {
	db: Db;
	store: ObjectStore;
	request: Request;
	venueId: string;
	sensorId: string;
	personId: string | null;
	filename: string | null;
	updateRateHz?: number | null;
}) {
	const { db, store, request, venueId, sensorId } = opts;
	const [sensor] = await db
		.select({ id: sensors.id })
		.from(sensors)
		.where(and(eq(sensors.id, sensorId), eq(sensors.venueId, venueId)));
	if (!sensor)
		return { ok: false, status: 404, message: 'There is no such sensor.' } as UploadRefusal;
	const early = tooLongByHeader(request, CAPTURE_MAX_BYTES);
	if (early) return early;
	const spooled = await spool(request.body, CAPTURE_MAX_BYTES);
	if (!('path' in spooled)) return spooled;
	try {
		const sniffed = await fileTypeFromBuffer(spooled.head);
		if (sniffed)
			return {
				ok: false,
				status: 415,
				message: `That file is ${sniffed.mime}, not a CSV of readings.`
			} as UploadRefusal;
		const rate = opts.updateRateHz && opts.updateRateHz > 0 ? opts.updateRateHz : undefined;
		const result = await readCapture(createReadStream(spooled.path), { updateRateHz: rate });
		if (!result.ok || result.errors.length) {
			const first = result.errors[0];
			return {
				ok: false,
				status: 400,
				line: first?.line ?? null,
				message: `The capture was not stored. ${first ? capitalise(first.message) : 'It could not be read.'}${
					result.errors.length > 1 ? ` (${result.errors.length} problems in all)` : ''
				}`
			} as UploadRefusal;
		}
		const s = result.summary;
		if (s.rows === 0)
			return { ok: false, status: 400, message: 'The capture has no readings.' } as UploadRefusal;
		let calibration = null;
		let calibrationProblem: string | null = null;
		if (s.idle.count > 0 && s.present.count > 0) {
			try {
				calibration = calibrate({
					idle: s.idle,
					present: s.present,
					updateRateHz: s.updateRateHz,
					driftPerMinute: s.driftPerMinute,
					driftStandardErrorPerMinute: s.driftStandardErrorPerMinute,
					driftDegreesOfFreedom: s.driftDegreesOfFreedom
				});
			} catch (e) {
				if (!(e instanceof CalibrationInputError)) throw e;
				calibrationProblem = e.message;
			}
		} else calibrationProblem = 'The capture needs both idle and present readings to calibrate.';
		const strip = ({ count, mean, sigma, min, max }: typeof s.idle) => ({
			count,
			mean,
			sigma,
			min: Number.isFinite(min) ? min : 0,
			max: Number.isFinite(max) ? max : 0
		});
		const summary: StoredCaptureSummary = {
			idle: strip(s.idle),
			present: strip(s.present),
			timed: s.timed,
			updateRateHz: s.updateRateHz,
			driftPerMinute: s.driftPerMinute,
			driftStandardErrorPerMinute: s.driftStandardErrorPerMinute,
			histograms: captureHistograms(s),
			calibration,
			calibrationProblem
		};
		const filename = cleanFilename(opts.filename, 'capture.csv');
		const objectKey = `venues/${venueId}/captures/${randomUUID()}.csv`;
		await store.putFile(objectKey, spooled.path, 'text/csv');
		// The sensor or prop may have been removed meanwhile: then the object must not stay behind.
		const [row] = await db
			.insert(captures)
			.values({
				venueId,
				sensorId,
				objectKey,
				filename,
				sizeBytes: spooled.size,
				sha256: spooled.sha256,
				rows: s.rows,
				idleRows: s.idle.count,
				presentRows: s.present.count,
				summary: summary as unknown as Record<string, unknown>,
				uploadedBy: opts.personId
			})
			.returning()
			.catch(async (e: unknown) => {
				await discardObjects(store, [objectKey]);
				throw e;
			});
		return { ok: true as const, capture: row };
	} finally {
		await rm(spooled.dir, { recursive: true, force: true });
	}
}

function capitalise(s: string) {
	return s.charAt(0).toUpperCase() + s.slice(1) + (/[.!?]$/.test(s) ? '' : '.');
}

/** Receives a photo (PNG, JPEG, WebP up to 10 MB) or a wiring PDF (up to 20 MB), checked by content. */
export async function ingestPropFile(opts: {
	db: Db;
	store: ObjectStore;
	request: Request;
	venueId: string;
	propId: string;
	personId: string | null;
	filename: string | null;
}) {
	const { db, store, request, venueId, propId } = opts;
	const [prop] = await db
		.select({ id: props.id })
		.from(props)
		.where(and(eq(props.id, propId), eq(props.venueId, venueId)));
	if (!prop) return { ok: false, status: 404, message: 'There is no such prop.' } as UploadRefusal;
	const early = tooLongByHeader(request, PDF_MAX_BYTES);
	if (early) return early;
	const spooled = await spool(request.body, PDF_MAX_BYTES);
	if (!('path' in spooled)) return spooled;
	try {
		const sniffed = await fileTypeFromBuffer(spooled.head);
		const mime = sniffed?.mime ?? 'unknown';
		const isImage = IMAGE_TYPES.includes(mime);
		if (!isImage && mime !== 'application/pdf')
			return {
				ok: false,
				status: 415,
				message: 'Upload a photo (PNG, JPEG or WebP) or a wiring PDF; that file is neither.'
			} as UploadRefusal;
		if (isImage && spooled.size > IMAGE_MAX_BYTES)
			return {
				ok: false,
				status: 413,
				message: `Photos may be at most ${mb(IMAGE_MAX_BYTES)}.`
			} as UploadRefusal;
		const ext = sniffed!.ext;
		const objectKey = `venues/${venueId}/props/${propId}/${randomUUID()}.${ext}`;
		await store.putFile(objectKey, spooled.path, mime);
		// The sensor or prop may have been removed meanwhile: then the object must not stay behind.
		const [row] = await db
			.insert(propFiles)
			.values({
				venueId,
				propId,
				kind: isImage ? 'photo' : 'wiring',
				objectKey,
				filename: cleanFilename(opts.filename, `file.${ext}`),
				contentType: mime,
				sizeBytes: spooled.size,
				sha256: spooled.sha256,
				uploadedBy: opts.personId
			})
			.returning()
			.catch(async (e: unknown) => {
				await discardObjects(store, [objectKey]);
				throw e;
			});
		return { ok: true as const, file: row };
	} finally {
		await rm(spooled.dir, { recursive: true, force: true });
	}
}

/**
 * A photo taken during a pre-show check: stored under the show's prefix, and linked when the
 * result that names it is recorded. Only PNG, JPEG or WebP up to the photo limit.
 */
export async function ingestCheckPhoto(opts: {
	store: ObjectStore;
	request: Request;
	prefix: string;
}): Promise<{ ok: true; key: string } | UploadRefusal> {
	const early = tooLongByHeader(opts.request, IMAGE_MAX_BYTES);
	if (early) return { ...early, message: `Photos may be at most ${mb(IMAGE_MAX_BYTES)}.` };
	const spooled = await spool(opts.request.body, IMAGE_MAX_BYTES);
	if (!('path' in spooled)) return spooled;
	try {
		const sniffed = await fileTypeFromBuffer(spooled.head);
		if (!sniffed || !IMAGE_TYPES.includes(sniffed.mime))
			return { ok: false, status: 415, message: 'Take or choose a photo (PNG, JPEG or WebP).' };
		const key = `${opts.prefix}${randomUUID()}.${sniffed.ext}`;
		await opts.store.putFile(key, spooled.path, sniffed.mime);
		return { ok: true, key };
	} finally {
		await rm(spooled.dir, { recursive: true, force: true });
	}
}
