// @ts-check
// `npm run bench`: the performance figures, each against a floor measured in the same run. Not a
// test and not part of `npm test`. Starts its own PostgreSQL (.data/pg-bench/, its own port), loads
// the demo data and a large venue (scripts/bench/large-venue.ts), builds and starts the app, and
// measures requests at 50 connections against a bare route (one indexed primary-key query), then
// season expansion against rrule and capture analysis against a plain read and split, and reads
// each page's JavaScript from the build (scripts/bench/page-js.mjs). Prints one
// table: what, figure, floor, ratio.
//   BENCH_SECONDS=5   seconds per route (after a 1 s warm-up)
//   BENCH_PROPS=2000 BENCH_SCENES=200 BENCH_PER_SCENE=3   size of the large venue
//   BENCH_ROWS=1000000   capture rows
//   BENCH_SKIP_BUILD=1   use the build/ already there
//   BENCH_ROUTES=checklist,show   only the routes whose name contains one of these (the bare route,
//     signed out, always runs as the floor)
//   BENCH_ROUTES_ONLY=1   skip season expansion, capture analysis and the boards
//   BENCH_ONLY=boards   only the boards benchmark (scripts/bench/boards.mjs, its own variables there;
//     BENCH_BOARD_SECONDS=15 for a short try); BENCH_BOARDS_SKIP=1 leaves it out of the full run
import http from 'node:http';
import { existsSync, readFileSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import { ensureDependencies } from './lib/deps.mjs';
import { LOCAL } from './lib/ports.mjs';
import { ensurePostgres, recreateDatabase, stopPostgres } from './lib/pg.mjs';
import { localSecret } from './lib/secret.mjs';
import { runNode, startChild, stopChildren } from './lib/children.mjs';

const ports = LOCAL.bench;
const origin = `http://127.0.0.1:${ports.appPort}`;
const SECONDS = Number(process.env.BENCH_SECONDS ?? 5);
const CONNECTIONS = 50;
const PASSWORD = 'lantern-demo-2026';

ensureDependencies();
if (process.env.BENCH_ONLY === 'boards') {
	const res = spawnSync(process.execPath, ['scripts/bench/boards.mjs'], { stdio: 'inherit' });
	process.exit(res.status ?? 1);
}
const base = await ensurePostgres({
	dataDir: ports.pgDir,
	port: ports.pgPort,
	database: 'postgres'
});
recreateDatabase({ port: ports.pgPort, database: 'gloaming_bench' });
const databaseUrl = base.replace(/\/postgres$/, '/gloaming_bench');

const env = {
	DATABASE_URL: databaseUrl,
	AUTH_SECRET: localSecret(),
	ORIGIN: origin,
	HOST: '127.0.0.1',
	PORT: String(ports.appPort),
	SMTP_HOST: '127.0.0.1',
	SMTP_PORT: String(ports.smtpPort),
	MAIL_WEB_PORT: String(ports.mailWebPort),
	S3_ENDPOINT: `http://127.0.0.1:${ports.s3Port}`,
	S3_PORT: String(ports.s3Port),
	S3_DIR: ports.s3Dir,
	S3_BUCKET: 'gloaming',
	S3_ACCESS_KEY_ID: 'S3RVER',
	S3_SECRET_ACCESS_KEY: 'S3RVER',
	BODY_SIZE_LIMIT: '52M'
};

/** @param {string[]} args @returns {any} the JSON a script printed last */
function nodeJson(args) {
	const res = spawnSync(process.execPath, args, {
		env: { ...process.env, ...env },
		encoding: 'utf8',
		maxBuffer: 1 << 26
	});
	if (res.status !== 0) throw new Error(`node ${args.join(' ')} failed:\n${res.stderr}`);
	return JSON.parse(res.stdout.trim().split('\n').pop() ?? 'null');
}

/** Resident memory of a process in bytes, from /proc. @param {number | undefined} pid */
function rss(pid) {
	try {
		const m = readFileSync(`/proc/${pid}/status`, 'utf8').match(/VmRSS:\s+(\d+) kB/);
		return m ? Number(m[1]) * 1024 : 0;
	} catch {
		return 0;
	}
}

/** @param {string} path @param {string} cookie @param {http.Agent} agent @returns {Promise<number>} */
function get(path, cookie, agent) {
	return new Promise((resolve, reject) => {
		const req = http.get(
			{ host: '127.0.0.1', port: ports.appPort, path, agent, headers: { cookie } },
			(res) => {
				res.resume();
				res.on('end', () => resolve(res.statusCode ?? 0));
			}
		);
		req.on('error', reject);
	});
}

/**
 * Requests from 50 connections for the given seconds, each connection one request at a time.
 * @param {string} path @param {string} cookie @param {number} seconds
 */
async function load(path, cookie, seconds) {
	const agent = new http.Agent({ keepAlive: true, maxSockets: CONNECTIONS });
	/** @type {number[]} */
	const times = [];
	let failed = 0;
	const until = performance.now() + seconds * 1000;
	const started = performance.now();
	const worker = async () => {
		while (performance.now() < until) {
			const t = performance.now();
			const status = await get(path, cookie, agent);
			times.push(performance.now() - t);
			if (status !== 200) failed++;
		}
	};
	await Promise.all(Array.from({ length: CONNECTIONS }, worker));
	const elapsed = (performance.now() - started) / 1000;
	agent.destroy();
	times.sort((a, b) => a - b);
	return {
		p95: times[Math.min(times.length - 1, Math.floor(times.length * 0.95))],
		perSecond: times.length / elapsed,
		failed,
		count: times.length
	};
}

/** Signs a demo person in with the sign-in page's password form; returns the cookie header. @param {string} email */
async function signIn(email) {
	const res = await fetch(`${origin}/sign-in?/password`, {
		method: 'POST',
		redirect: 'manual',
		headers: { 'content-type': 'application/x-www-form-urlencoded', origin },
		body: new URLSearchParams({
			providerId: 'credentials',
			redirectTo: '/venues',
			email,
			password: PASSWORD
		})
	});
	const session = res.headers
		.getSetCookie()
		.map((c) => c.split(';')[0])
		.find((c) => c.includes('session-token='));
	if (!session) throw new Error(`Could not sign ${email} in (status ${res.status}).`);
	return session;
}

/** @type {[string, string, string, string][]} what, figure, floor, ratio */
const table = [];
const ms = (/** @type {number} */ x) => `${x < 10 ? x.toFixed(2) : x.toFixed(0)} ms`;
const mb = (/** @type {number} */ x) => `${(x / 1024 / 1024).toFixed(0)} MB`;
const ratio = (/** @type {number} */ a, /** @type {number} */ b) => `${(a / b).toFixed(2)}x`;

let failed = false;
try {
	console.log('[bench] preparing the database and the large venue…');
	runNode(['--import', 'tsx', 'scripts/migrate.ts'], env);
	runNode(['--import', 'tsx', 'scripts/seed.ts'], env);
	const size = [
		process.env.BENCH_PROPS ?? '2000',
		process.env.BENCH_SCENES ?? '200',
		process.env.BENCH_PER_SCENE ?? '3'
	];
	const big = nodeJson(['--import', 'tsx', 'scripts/bench/large-venue.ts', ...size]);
	if (!process.env.BENCH_SKIP_BUILD || !existsSync('build/index.js')) {
		console.log('[bench] building the app…');
		runNode(['node_modules/vite/bin/vite.js', 'build', '--logLevel', 'warn'], env);
	}
	await startChild('mail catcher', ['--import', 'tsx', 'scripts/mail-catcher.ts'], env, {
		waitFor: /\[mail\]/
	});
	await startChild('object store', ['--import', 'tsx', 'scripts/object-store.ts'], env, {
		waitFor: /\[objects\]/
	});
	const app = /** @type {import('node:child_process').ChildProcess} */ (
		await startChild('app', ['build/index.js'], env, { waitFor: /Listening/ })
	);
	const idleMemory = rss(app.pid);
	let peakMemory = idleMemory;
	const sampler = setInterval(() => (peakMemory = Math.max(peakMemory, rss(app.pid))), 100);

	const manager = await signIn('manager@gloaming.test');
	const crew = await signIn('crew@gloaming.test');
	const v = `/api/v/${big.slug}`;
	const page = `/v/${big.slug}`;
	const show = big.showId;
	const checks = /** @type {{ checks?: unknown[] }} */ (
		await (await fetch(`${origin}${v}/shows/${show}/checks`, { headers: { cookie: crew } })).json()
	);
	const checkCount = checks.checks?.length ?? 0;
	console.log(
		`[bench] ${big.props} props, ${big.scenes} scenes, ${checkCount} checks on tonight's show; ` +
			`${SECONDS} s per route at ${CONNECTIONS} connections`
	);

	/** @type {[string, string, string][]} */
	const routes = [
		['bare route, signed out', '/health', ''],
		['bare route, signed in (venue API)', v, manager],
		['rooms API', `${v}/rooms`, manager],
		['props API', `${v}/props`, manager],
		["a show's checks API", `${v}/shows/${show}/checks`, crew],
		['crew checklist page', `${page}/shows/${show}/checklist`, crew],
		['show page', `${page}/shows/${show}`, manager],
		['Tonight page', page, manager],
		['Tonight page, crew', page, crew],
		['checklist print page', `${page}/shows/${show}/checklist/print`, manager],
		['stand-down page', `${page}/shows/${show}/stand-down`, manager],
		['incidents page', `${page}/shows/${show}/incidents`, manager],
		['close-of-night page', `${page}/shows/${show}/close`, manager],
		['season report page', `${page}/seasons/${big.seasonId}`, manager],
		['sensor page (baselines)', `${page}/props/${big.propId}/sensors/${big.sensorId}`, manager],
		['sensor live API', `${v}/props/${big.propId}/sensors/${big.sensorId}/live`, manager],
		['prop page (maintenance due)', `${page}/props/${big.propId}`, manager]
	];
	/** @type {number | null} */
	let floor = null;
	const only = (process.env.BENCH_ROUTES ?? '')
		.split(',')
		.map((w) => w.trim().toLowerCase())
		.filter(Boolean);
	const chosen = routes.filter(
		([what], i) => i === 0 || !only.length || only.some((w) => what.toLowerCase().includes(w))
	);
	for (const [what, path, cookie] of chosen) {
		await load(path, cookie, 1);
		const r = await load(path, cookie, SECONDS);
		if (r.failed > 0) console.error(`[bench] ${what}: ${r.failed} of ${r.count} requests not 200`);
		floor ??= r.p95;
		table.push([
			`${what}: p95 at ${CONNECTIONS} connections (${r.perSecond.toFixed(0)} req/s)`,
			ms(r.p95),
			ms(floor),
			ratio(r.p95, floor)
		]);
	}
	clearInterval(sampler);
	table.push([
		'app memory, peak through the requests',
		mb(peakMemory),
		mb(idleMemory),
		ratio(peakMemory, idleMemory)
	]);
	stopChildren();
	// Page JavaScript from the build (scripts/bench/page-js.mjs): every main page under 80 KB
	// gzipped, the crew checklist under 50 KB; any other page over 80 KB is listed too.
	/** @type {{ page: string, kb: number }[]} */
	const js = nodeJson(['scripts/bench/page-js.mjs', '--json']);
	/** @type {[string, string, number][]} folder under (app)/v/[venue] or (auth), what, limit */
	const screens = [
		['(auth)/sign-in', 'sign-in', 80],
		['(app)/v/_venue_', 'Tonight', 80],
		['(app)/v/_venue_/shows/_show_uuid_/checklist', 'crew checklist', 50],
		['(app)/v/_venue_/shows/_show_uuid_', 'show page', 80],
		['(app)/v/_venue_/shows/_show_uuid_/incidents', 'incidents', 80],
		['(app)/v/_venue_/shows/_show_uuid_/close', 'close of night', 80],
		['(app)/v/_venue_/props', 'props', 80],
		['(app)/v/_venue_/props/_prop_uuid_', 'prop page (maintenance due)', 80],
		['(app)/v/_venue_/props/_prop_uuid_/sensors/_sensor_uuid_', 'sensor page', 80],
		['(app)/v/_venue_/props/_prop_uuid_/outputs/_output_uuid_', 'output page', 80],
		['(app)/v/_venue_/scenes/_scene_uuid_', 'scene editor', 80],
		['(app)/v/_venue_/calendar', 'calendar', 80],
		['(app)/v/_venue_/seasons/_season_uuid_', 'season report', 80]
	];
	for (const r of js) {
		const named = screens.find(([dir]) => dir === r.page);
		if (!named && r.kb <= 80) continue;
		const [, what, limit] = named ?? [r.page, r.page, 80];
		table.push([
			`page JavaScript, gzipped: ${what} vs its limit`,
			`${r.kb.toFixed(1)} KB`,
			`${limit} KB`,
			ratio(r.kb, limit)
		]);
	}
	if (!process.env.BENCH_ROUTES_ONLY) {
		console.log('[bench] season expansion…');
		const season = nodeJson(['--import', 'tsx', 'scripts/bench/season.ts']);
		table.push([
			`season expansion, 365-night DST rule (${season.nights} nights), median vs rrule's own`,
			ms(season.appMs),
			ms(season.rruleMs),
			ratio(season.appMs, season.rruleMs)
		]);

		console.log('[bench] capture analysis…');
		const rows = process.env.BENCH_ROWS ?? '1000000';
		const capture = nodeJson(['--import', 'tsx', 'scripts/bench/capture.ts', rows, '--json']);
		const n = Number(rows).toLocaleString('en');
		table.push([
			`capture analysis, ${n} rows, best of 3 vs plain read and split`,
			ms(capture.stream.ms),
			ms(capture.plain.ms),
			ratio(capture.stream.ms, capture.plain.ms)
		]);
		table.push([
			`capture analysis, ${n} rows, peak memory vs plain read and split`,
			mb(capture.stream.peak),
			mb(capture.plain.peak),
			ratio(capture.stream.peak, capture.plain.peak)
		]);
		if (!process.env.BENCH_BOARDS_SKIP) {
			console.log('[bench] boards through the broker…');
			const b = nodeJson(['scripts/bench/boards.mjs', '--json', '--keep-running']);
			const what = `${b.boards} boards at ${b.hz} readings/s for ${b.seconds} s (${b.stored} of ${b.expected} stored)`;
			table.push([
				`${what}: readings stored per second vs a bare subscriber's count`,
				b.appPerSecond.toFixed(0),
				b.barePerSecond.toFixed(0),
				ratio(b.appPerSecond, b.barePerSecond)
			]);
			table.push([
				'boards: lag p95, publish to stored vs publish to the bare subscriber',
				ms(b.appLagP95),
				ms(b.bareLagP95),
				ratio(b.appLagP95, Math.max(1, b.bareLagP95))
			]);
			table.push([
				'boards: app memory, peak through the readings vs idle',
				mb(b.peakMemory),
				mb(b.idleMemory),
				ratio(b.peakMemory, b.idleMemory)
			]);
		}
	}
} catch (e) {
	failed = true;
	console.error(`[bench] ${e instanceof Error ? e.message : e}`);
} finally {
	stopChildren();
	setTimeout(() => stopPostgres({ dataDir: ports.pgDir }), 300);
}

if (table.length) {
	const head = /** @type {[string, string, string, string]} */ ([
		'what',
		'figure',
		'floor',
		'ratio'
	]);
	const widths = head.map((h, i) => Math.max(h.length, ...table.map((r) => r[i].length)));
	const line = (/** @type {string[]} */ r) =>
		`| ${r.map((c, i) => (i === 0 ? c.padEnd(widths[i]) : c.padStart(widths[i]))).join(' | ')} |`;
	console.log(
		[
			'',
			line(head),
			`|${widths.map((w) => '-'.repeat(w + 2)).join('|')}|`,
			...table.map(line)
		].join('\n')
	);
}
process.exitCode = failed ? 1 : 0;
