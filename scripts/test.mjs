// @ts-check
// `npm test`: every test, against its own PostgreSQL (port and data separate from `npm start`).
// While working on one part: `npm test -- --vitest [vitest args]` runs only vitest, and
// `npm test -- --e2e [playwright args]` only the build and the browser tests (say, one spec file).
import { spawnSync } from 'node:child_process';
import { ensureDebianPackages, hasFile } from './lib/debian.mjs';
import { ensureDependencies } from './lib/deps.mjs';
import { LOCAL } from './lib/ports.mjs';
import { ensurePostgres, recreateDatabase, stopPostgres } from './lib/pg.mjs';
import { ensureMosquitto, stopMosquitto } from './lib/mosquitto.mjs';

const t = LOCAL.test;
const [mode, ...rest] = process.argv.slice(2);
const only = mode === '--vitest' ? 'vitest' : mode === '--e2e' ? 'e2e' : null;
if (mode && !only) {
	console.error(`[test] unknown option ${mode}: use --vitest or --e2e, or nothing for every test`);
	process.exit(2);
}
const started = Date.now();
ensureDependencies();
// Everything the run needs from Debian, checked before the first step rather than when it is reached.
ensureDebianPackages(
	only === 'vitest'
		? []
		: [
				{
					pkg: 'chromium',
					what: 'Chromium for the browser tests',
					present: hasFile(process.env.CHROMIUM_PATH ?? '/usr/bin/chromium')
				}
			]
);

/** @param {string} label @param {string[]} args @param {NodeJS.ProcessEnv} [env] */
function step(label, args, env = {}) {
	console.log(`\n[test] ${label}`);
	const res = spawnSync(process.execPath, args, {
		stdio: 'inherit',
		env: { ...process.env, ...env }
	});
	if (res.status !== 0) {
		console.error(`[test] ${label} failed`);
		finish(res.status ?? 1);
	}
}

let pgStarted = false;
let mqttStarted = false;
/** @param {number} code */
function finish(code) {
	if (pgStarted && !process.env.KEEP_TEST_DB) stopPostgres({ dataDir: t.pgDir });
	if (mqttStarted && !process.env.KEEP_TEST_DB) stopMosquitto({ dataDir: t.mqttDir });
	console.log(
		`[test] ${code === 0 ? 'all passed' : 'FAILED'} in ${Math.round((Date.now() - started) / 1000)} s`
	);
	process.exit(code);
}

const base = await ensurePostgres({ dataDir: t.pgDir, port: t.pgPort, database: 'postgres' });
pgStarted = true;
const mqttUrl = await ensureMosquitto({ dataDir: t.mqttDir, port: t.mqttPort });
mqttStarted = true;
const urlFor = (/** @type {string} */ db) => base.replace(/\/postgres$/, `/${db}`);

step('sync SvelteKit types', ['node_modules/@sveltejs/kit/svelte-kit.js', 'sync']);
if (!only)
	step('type check', [
		'node_modules/svelte-check/bin/svelte-check',
		'--tsconfig',
		'./tsconfig.json',
		'--threshold',
		'error',
		'--output',
		'human'
	]);
if (!only)
	step('type check (service worker)', [
		'node_modules/typescript/bin/tsc',
		'-p',
		'tsconfig.service-worker.json'
	]);
if (!only) step('lint', ['node_modules/eslint/bin/eslint.js', '.']);

if (only !== 'e2e') {
	recreateDatabase({ port: t.pgPort, database: 'gloaming_it' });
	step('unit and integration tests', ['node_modules/vitest/vitest.mjs', 'run', ...rest], {
		TEST_DATABASE_URL: urlFor('gloaming_it'),
		TEST_MQTT_URL: mqttUrl
	});
	if (only === 'vitest') finish(0);
}

step('production build', ['node_modules/vite/bin/vite.js', 'build', '--logLevel', 'warn']);

recreateDatabase({ port: t.pgPort, database: 'gloaming_e2e' });
const e2eUrl = urlFor('gloaming_e2e');
step('prepare browser-test database', ['--import', 'tsx', 'scripts/migrate.ts'], {
	DATABASE_URL: e2eUrl
});
step('load demo data', ['--import', 'tsx', 'scripts/seed.ts'], { DATABASE_URL: e2eUrl });
// Given journey spec files, run just those, not the page checks the journeys otherwise wait for
// (the page checks keep their own sign-in step).
const onlyJourneys = rest.some((a) => a.endsWith('.ts')) && !rest.some((a) => a.includes('pages'));
const e2eArgs = onlyJourneys ? ['--no-deps', ...rest] : rest;
step('browser tests', ['node_modules/@playwright/test/cli.js', 'test', ...e2eArgs], {
	E2E_DATABASE_URL: e2eUrl
});

finish(0);
