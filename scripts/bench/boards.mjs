// @ts-check
// The boards benchmark: BENCH_BOARDS (200) simulated boards, each sending BENCH_BOARD_HZ (10)
// readings a second for BENCH_BOARD_SECONDS (60) through the local Mosquitto broker to the built
// app, which checks each message's key and stores the readings. Against a floor measured in the
// same run: a bare MQTT subscriber on the same topics that only counts messages. Reports readings
// stored per second, end-to-end lag p95 (publish → the app's stored time, and publish → the bare
// subscriber's receipt) and the app's memory, with ratios. Not a test; run by `npm run bench`
// (after its other parts) or alone with `BENCH_ONLY=boards npm run bench` or
// `node scripts/bench/boards.mjs`.
//   BENCH_BOARDS=200 BENCH_BOARD_HZ=10 BENCH_BOARD_SECONDS=60   the load (shorter to try: 15)
//   BENCH_BOARD_BATCH=10   readings per message (a board sending once a second, like the simulator)
//   BENCH_SKIP_BUILD=1   use the build/ already there
//   --json   print the figures as one JSON line at the end (for scripts/bench.mjs)
//   --keep-running   leave PostgreSQL running afterwards (scripts/bench.mjs stops it)
import { createHash, randomBytes } from 'node:crypto';
import { existsSync, readFileSync } from 'node:fs';
import mqtt from 'mqtt';
import postgres from 'postgres';
import { LOCAL } from '../lib/ports.mjs';
import { ensurePostgres, recreateDatabase, stopPostgres } from '../lib/pg.mjs';
import { ensureMosquitto, stopMosquitto } from '../lib/mosquitto.mjs';
import { localSecret } from '../lib/secret.mjs';
import { runNode, startChild, stopChildren } from '../lib/children.mjs';

const BOARDS = Number(process.env.BENCH_BOARDS ?? 200);
const HZ = Number(process.env.BENCH_BOARD_HZ ?? 10);
const SECONDS = Number(process.env.BENCH_BOARD_SECONDS ?? 60);
const BATCH = Math.max(1, Number(process.env.BENCH_BOARD_BATCH ?? 10));
const asJson = process.argv.includes('--json');
const log = (/** @type {string} */ line) =>
	(asJson ? console.error : console.log)(`[bench boards] ${line}`);

const ports = LOCAL.bench;
const origin = `http://127.0.0.1:${ports.appPort}`;
const base = await ensurePostgres({
	dataDir: ports.pgDir,
	port: ports.pgPort,
	database: 'postgres'
});
recreateDatabase({ port: ports.pgPort, database: 'gloaming_bench_boards' });
const databaseUrl = base.replace(/\/postgres$/, '/gloaming_bench_boards');
const mqttUrl = await ensureMosquitto({ dataDir: ports.mqttDir, port: ports.mqttPort });
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
	MQTT_URL: mqttUrl
};

/** Resident memory of a process in bytes, from /proc. @param {number | undefined} pid */
function rss(pid) {
	try {
		const m = readFileSync(`/proc/${pid}/status`, 'utf8').match(/VmRSS:\s+(\d+) kB/);
		return m ? Number(m[1]) * 1024 : 0;
	} catch {
		return 0;
	}
}

/** @param {number[]} xs @param {number} q */
function quantile(xs, q) {
	if (!xs.length) return NaN;
	const s = [...xs].sort((a, b) => a - b);
	return s[Math.min(s.length - 1, Math.floor(s.length * q))];
}

const hash = (/** @type {string} */ t) => createHash('sha256').update(t).digest('hex');

/** 200 controllers in one invented venue, one plate sensor each, each with a key. */
async function makeBoards(/** @type {import('postgres').Sql} */ sql) {
	const [venue] = await sql`
		insert into venues (name, slug, kind, time_zone) values ('Bench Hollow', ${`bench-hollow-${Date.now()}`}, 'haunt', 'Europe/London')
		returning id`;
	/** @type {{ id: string, token: string }[]} */
	const boards = [];
	for (let i = 0; i < BOARDS; i++) {
		const [c] = await sql`
			insert into controllers (venue_id, name, supply_v, clock_hz, timer_bits, pwm_bits, prescaler,
				reference_v, pin_limit_ma, supply_rating_a)
			values (${venue.id}, ${`Bench board ${i + 1}`}, 5, 16000000, 16, 8, 64, 1.1, 20, 2)
			returning id`;
		const [p] = await sql`
			insert into props (venue_id, name, controller_id) values (${venue.id}, ${`Bench prop ${i + 1}`}, ${c.id})
			returning id`;
		await sql`
			insert into sensors (venue_id, prop_id, name, kind, settings)
			values (${venue.id}, ${p.id}, 'Plate', 'capacitive', ${sql.json({
				kind: 'capacitive',
				resistanceOhm: 1e6,
				plateAreaCm2: 100,
				gapMm: 10,
				strayPf: 10,
				samplesAveraged: 4,
				readingNoiseCounts: 2,
				handFraction: 0.5
			})})`;
		const token = 'glb_' + randomBytes(32).toString('base64url');
		await sql`
			insert into board_keys (venue_id, controller_id, token_hash, hint)
			values (${venue.id}, ${c.id}, ${hash(token)}, ${token.slice(0, 10)})`;
		boards.push({ id: c.id, token });
	}
	return { venueId: venue.id, boards };
}

/** @type {Record<string, number | string>} */
const figures = {};
let failed = false;
try {
	log('preparing the database…');
	runNode(['--import', 'tsx', 'scripts/migrate.ts'], env);
	if (!process.env.BENCH_SKIP_BUILD || !existsSync('build/index.js')) {
		log('building the app…');
		runNode(['node_modules/vite/bin/vite.js', 'build', '--logLevel', 'warn'], env);
	}
	const sql = postgres(databaseUrl, { max: 2, onnotice: () => {} });
	const { venueId, boards } = await makeBoards(sql);
	await startChild('mail catcher', ['--import', 'tsx', 'scripts/mail-catcher.ts'], env, {
		waitFor: /\[mail\]/
	});
	await startChild('object store', ['--import', 'tsx', 'scripts/object-store.ts'], env, {
		waitFor: /\[objects\]/
	});
	const app = /** @type {import('node:child_process').ChildProcess} */ (
		await startChild('app', ['build/index.js'], env, { waitFor: /Listening/ })
	);
	// Wait for the app's subscription before sending.
	for (
		let i = 0;
		i < 50 &&
		!(await fetch(`${origin}/health`).then(
			(r) => r.ok,
			() => false
		));
		i++
	)
		await new Promise((r) => setTimeout(r, 200));
	await new Promise((r) => setTimeout(r, 1500));
	const idleMemory = rss(app.pid);
	let peakMemory = idleMemory;
	const sampler = setInterval(() => (peakMemory = Math.max(peakMemory, rss(app.pid))), 200);

	// The floor: a bare subscriber that only counts, with each message's receipt time.
	/** @type {Map<string, number>} topic|seq → publish time */
	const published = new Map();
	/** @type {number[]} */
	const bareLag = [];
	let bareReadings = 0;
	let bareFirst = 0;
	let bareLast = 0;
	const bare = await mqtt.connectAsync(mqttUrl, { clientId: `bench-floor-${process.pid}` });
	bare.on('message', (topic, payload) => {
		const t = Date.now();
		const m = /"seq":(\d+)/.exec(payload.toString('utf8'));
		const sent = m ? published.get(`${topic.split('/')[1]}|${m[1]}`) : undefined;
		if (sent !== undefined) bareLag.push(t - sent);
		bareReadings += BATCH;
		bareFirst ||= t;
		bareLast = t;
	});
	await bare.subscribeAsync('gloaming/+/readings', { qos: 1 });

	// The boards: one connection each, as real boards have, spread over each period.
	log(`${BOARDS} boards, ${HZ} readings a second each, ${BATCH} a message, for ${SECONDS} s…`);
	const clients = await Promise.all(
		boards.map((b, i) =>
			mqtt.connectAsync(mqttUrl, { clientId: `bench-board-${i}-${process.pid}` })
		)
	);
	const periodMs = (1000 * BATCH) / HZ;
	const messages = Math.floor((SECONDS * HZ) / BATCH);
	const started = Date.now();
	await Promise.all(
		boards.map(async (b, i) => {
			const topic = `gloaming/${b.id}/readings`;
			await new Promise((r) => setTimeout(r, (periodMs * i) / BOARDS));
			for (let k = 0; k < messages; k++) {
				const due = started + (periodMs * i) / BOARDS + k * periodMs;
				const wait = due - Date.now();
				if (wait > 0) await new Promise((r) => setTimeout(r, wait));
				const readings = Array.from({ length: BATCH }, (_, j) => ({
					sensor: 'plate',
					seq: k * BATCH + j + 1,
					reading: Number((1480 + Math.random() * 4).toFixed(2))
				}));
				published.set(`${b.id}|${readings[0].seq}`, Date.now());
				clients[i].publish(topic, JSON.stringify({ key: b.token, readings }), { qos: 1 });
			}
		})
	);
	const sentAll = Date.now();
	const expected = boards.length * messages * BATCH;
	// Drain: until every reading is stored, or nothing has arrived for 10 s.
	let stored = 0;
	let lastChange = Date.now();
	while (Date.now() - lastChange < 10_000) {
		const [r] = await sql`select count(*)::int as n from readings where venue_id = ${venueId}`;
		if (r.n !== stored) lastChange = Date.now();
		stored = r.n;
		if (stored >= expected) break;
		await new Promise((res) => setTimeout(res, 250));
	}
	clearInterval(sampler);
	// The app's lag: each message's first reading, publish time to the time the app stored it.
	const rows = await sql`
		select controller_id, seq, (extract(epoch from at) * 1000)::float8 as at,
			(select (extract(epoch from max(at)) * 1000)::float8 from readings where venue_id = ${venueId}) as last
		from readings where venue_id = ${venueId} and (seq - 1) % ${BATCH} = 0`;
	/** @type {number[]} */
	const appLag = [];
	for (const r of rows) {
		const sent = published.get(`${r.controller_id}|${r.seq}`);
		if (sent !== undefined) appLag.push(Number(r.at) - sent);
	}
	const appLast = rows.length ? Number(rows[0].last) : sentAll;
	const appPerSecond = stored / ((appLast - started) / 1000);
	const barePerSecond = bareReadings / ((bareLast - started) / 1000);
	Object.assign(figures, {
		boards: BOARDS,
		hz: HZ,
		seconds: SECONDS,
		expected,
		stored,
		appPerSecond,
		barePerSecond,
		appLagP95: quantile(appLag, 0.95),
		bareLagP95: quantile(bareLag, 0.95),
		idleMemory,
		peakMemory,
		drainMs: Math.max(0, appLast - sentAll)
	});
	await Promise.all([bare.endAsync(), ...clients.map((c) => c.endAsync())]);
	await sql.end();
	if (stored < expected) log(`only ${stored} of ${expected} readings were stored`);
} catch (e) {
	failed = true;
	log(e instanceof Error ? e.message : String(e));
} finally {
	stopChildren();
	stopMosquitto({ dataDir: ports.mqttDir });
	if (!process.argv.includes('--keep-running'))
		setTimeout(() => stopPostgres({ dataDir: ports.pgDir }), 300);
}

if (asJson) console.log(JSON.stringify(figures));
else if (figures.stored !== undefined) {
	const f = /** @type {Record<string, number>} */ (figures);
	const ms = (/** @type {number} */ x) => `${x < 10 ? x.toFixed(2) : x.toFixed(0)} ms`;
	const mb = (/** @type {number} */ x) => `${(x / 1024 / 1024).toFixed(0)} MB`;
	const rows = [
		[
			'readings stored per second',
			f.appPerSecond.toFixed(0),
			f.barePerSecond.toFixed(0),
			(f.appPerSecond / f.barePerSecond).toFixed(2) + 'x'
		],
		[
			'lag p95, publish to stored',
			ms(f.appLagP95),
			ms(f.bareLagP95),
			(f.appLagP95 / Math.max(1, f.bareLagP95)).toFixed(2) + 'x'
		],
		[
			'app memory, peak vs idle',
			mb(f.peakMemory),
			mb(f.idleMemory),
			(f.peakMemory / f.idleMemory).toFixed(2) + 'x'
		]
	];
	console.log(
		`\n${f.stored} of ${f.expected} readings stored; the last ${ms(f.drainMs)} after the last was sent`
	);
	for (const r of rows)
		console.log(
			`| ${r[0].padEnd(30)} | ${r[1].padStart(8)} | ${r[2].padStart(8)} | ${r[3].padStart(7)} |`
		);
}
process.exitCode = failed ? 1 : 0;
