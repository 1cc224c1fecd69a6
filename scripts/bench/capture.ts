// Benchmark, not a test: `node --import tsx scripts/bench/capture.ts [rows] [--json]` (part of
// `npm run bench`). Writes a capture of 1,000,000 rows (by default) to a temporary file, then reads
// it three times each, alternating: with the streaming reader the app uses, and with a plain parse
// that loads the file, splits lines and fields and reads each reading as a number. Prints the best
// time and the peak memory of each. Each read runs in a fresh process so one does not inherit the
// other's heap.
import { spawnSync } from 'node:child_process';
import { createReadStream, createWriteStream, readFileSync, statSync } from 'node:fs';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { once } from 'node:events';

const mode = process.argv[2];

async function writeCapture(path: string, rows: number) {
	const out = createWriteStream(path);
	out.write('time,reading,label\n');
	let seed = 7;
	const rand = () => (seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648;
	for (let i = 0; i < rows; i++) {
		const present = i % 10 >= 7;
		const reading = (present ? 180 : 120) + Math.round((rand() - 0.5) * 12);
		if (!out.write(`${(i / 100).toFixed(2)},${reading},${present ? 'present' : 'idle'}\n`))
			await once(out, 'drain');
	}
	out.end();
	await once(out, 'close');
}

/** Samples resident memory while the reader runs; heapUsed alone misses buffers. */
function peakTracker() {
	let peak = process.memoryUsage().rss;
	const timer = setInterval(() => {
		peak = Math.max(peak, process.memoryUsage().rss);
	}, 5);
	return () => {
		clearInterval(timer);
		return Math.max(peak, process.memoryUsage().rss);
	};
}

async function runStreaming(path: string) {
	const { readCapture } = await import('../../src/lib/calibration/capture');
	const stop = peakTracker();
	const started = performance.now();
	const result = await readCapture(createReadStream(path), { updateRateHz: 100 });
	const ms = performance.now() - started;
	return { ms, peak: stop(), rows: result.summary.rows, ok: result.ok };
}

async function runPlain(path: string) {
	const stop = peakTracker();
	const started = performance.now();
	const lines = readFileSync(path, 'utf8').split('\n');
	let rows = 0;
	let sum = 0;
	for (let i = 1; i < lines.length; i++) {
		if (!lines[i]) continue;
		const [, reading] = lines[i].split(',');
		sum += Number(reading);
		rows++;
	}
	const ms = performance.now() - started;
	return { ms, peak: stop(), rows, ok: Number.isFinite(sum) };
}

if (mode === '--child-stream' || mode === '--child-plain') {
	const path = process.argv[3];
	const r = mode === '--child-stream' ? await runStreaming(path) : await runPlain(path);
	console.log(JSON.stringify(r));
} else {
	const json = process.argv.includes('--json');
	const rows = Number(mode && mode !== '--json' ? mode : 1_000_000);
	const log = json ? () => {} : console.log;
	const dir = await mkdtemp(join(tmpdir(), 'gloaming-bench-'));
	const path = join(dir, 'capture.csv');
	try {
		log(`Writing ${rows.toLocaleString('en')} rows…`);
		await writeCapture(path, rows);
		log(`File: ${(statSync(path).size / 1024 / 1024).toFixed(1)} MB`);
		const mb = (b: number) => `${(b / 1024 / 1024).toFixed(0)} MB`;
		type Run = { ms: number; peak: number; rows: number; ok: boolean };
		const best: Record<string, Run> = {};
		for (let round = 0; round < 3; round++) {
			for (const flag of ['--child-stream', '--child-plain']) {
				const child = spawnSync(
					process.execPath,
					['--import', 'tsx', 'scripts/bench/capture.ts', flag, path],
					{ encoding: 'utf8' }
				);
				if (child.status !== 0) {
					console.error(child.stderr);
					process.exit(1);
				}
				const r: Run = JSON.parse(child.stdout.trim().split('\n').pop()!);
				if (r.rows !== rows) throw new Error(`${flag} read ${r.rows} rows of ${rows}`);
				const was = best[flag];
				best[flag] = {
					...r,
					ms: Math.min(r.ms, was?.ms ?? Infinity),
					peak: Math.max(r.peak, was?.peak ?? 0)
				};
			}
		}
		const stream = best['--child-stream'];
		const plain = best['--child-plain'];
		if (json) console.log(JSON.stringify({ rows, stream, plain }));
		else
			for (const [label, r] of [
				['readCapture (streaming)', stream],
				['plain read + split', plain]
			] as const)
				console.log(
					`${label.padEnd(26)} ${String(Math.round(r.ms)).padStart(6)} ms   peak RSS ${mb(r.peak).padStart(7)}   rows ${r.rows}`
				);
	} finally {
		await rm(dir, { recursive: true, force: true });
	}
}
