// @ts-check
// `npm start`: everything a fresh machine needs, then the app. Plain JavaScript so it can run
// before dependencies are installed.
import { ensureDependencies } from './lib/deps.mjs';
import { LOCAL } from './lib/ports.mjs';
import { ensurePostgres, stopPostgres } from './lib/pg.mjs';
import { ensureMosquitto, stopMosquitto } from './lib/mosquitto.mjs';
import { localSecret } from './lib/secret.mjs';
import { runNode, startChild, stopChildren } from './lib/children.mjs';

const ports = LOCAL.dev;
const origin = `http://127.0.0.1:${ports.appPort}`;

ensureDependencies();

const usingLocalDb = !process.env.DATABASE_URL;
const databaseUrl =
	process.env.DATABASE_URL ??
	(await ensurePostgres({ dataDir: ports.pgDir, port: ports.pgPort, database: 'gloaming' }));

const usingLocalBroker = !process.env.MQTT_URL;
const mqttUrl =
	process.env.MQTT_URL ?? (await ensureMosquitto({ dataDir: ports.mqttDir, port: ports.mqttPort }));

const env = {
	DATABASE_URL: databaseUrl,
	MQTT_URL: mqttUrl,
	AUTH_SECRET: localSecret(),
	ORIGIN: process.env.ORIGIN ?? origin,
	HOST: '127.0.0.1',
	PORT: String(ports.appPort),
	SMTP_HOST: process.env.SMTP_HOST ?? '127.0.0.1',
	SMTP_PORT: process.env.SMTP_PORT ?? String(ports.smtpPort),
	MAIL_WEB_PORT: String(ports.mailWebPort),
	S3_ENDPOINT: process.env.S3_ENDPOINT ?? `http://127.0.0.1:${ports.s3Port}`,
	S3_PORT: String(ports.s3Port),
	S3_DIR: ports.s3Dir,
	S3_BUCKET: process.env.S3_BUCKET ?? 'gloaming',
	S3_ACCESS_KEY_ID: process.env.S3_ACCESS_KEY_ID ?? 'S3RVER',
	S3_SECRET_ACCESS_KEY: process.env.S3_SECRET_ACCESS_KEY ?? 'S3RVER',
	BODY_SIZE_LIMIT: process.env.BODY_SIZE_LIMIT ?? '52M'
};

const simulating = process.env.GLOAMING_SIMULATOR !== '0';

let stopping = false;
function shutdown() {
	if (stopping) return;
	stopping = true;
	console.log('\n[setup] stopping…');
	stopChildren();
	if (usingLocalBroker) stopMosquitto({ dataDir: ports.mqttDir });
	if (usingLocalDb)
		setTimeout(() => {
			stopPostgres({ dataDir: ports.pgDir });
			process.exit(0);
		}, 500);
	else process.exit(0);
}
process.on('SIGINT', shutdown);
process.on('SIGTERM', shutdown);

try {
	await startChild('mail catcher', ['--import', 'tsx', 'scripts/mail-catcher.ts'], env, {
		waitFor: /\[mail\]/
	});
	await startChild('object store', ['--import', 'tsx', 'scripts/object-store.ts'], env, {
		waitFor: /\[objects\]/
	});
	runNode(['--import', 'tsx', 'scripts/migrate.ts'], env);
	runNode(['--import', 'tsx', 'scripts/seed.ts'], env);
	console.log('[setup] building the app…');
	runNode(['node_modules/vite/bin/vite.js', 'build', '--logLevel', 'warn'], env);
	await startChild('app', ['build/index.js'], env, { waitFor: /Listening/ });
	// The demo venues' boards, so a newcomer sees live readings at once.
	if (simulating)
		await startChild('board simulator', ['scripts/board-simulator.mjs'], env, {
			waitFor: /\[simulator\]/
		});
} catch (e) {
	console.error(`[setup] ${e instanceof Error ? e.message : e}`);
	shutdown();
	process.exitCode = 1;
}

if (!stopping) {
	console.log(`
  Gloaming is running.

    Open            ${env.ORIGIN}
    Mail inbox      http://127.0.0.1:${ports.mailWebPort}/   (every e-mail the app sends lands here)
    PostgreSQL      ${usingLocalDb ? `127.0.0.1:${ports.pgPort}, data in ${ports.pgDir}/` : 'from DATABASE_URL'}
    Object store    ${env.S3_ENDPOINT} (bucket ${env.S3_BUCKET})
    MQTT broker     ${mqttUrl} (boards publish to gloaming/<controller id>/readings)
    Boards          ${simulating ? 'the demo boards are simulated (GLOAMING_SIMULATOR=0 turns that off)' : 'not simulated (GLOAMING_SIMULATOR=0)'}

  Demo sign-in (password for all: lantern-demo-2026)
    owner@gloaming.test      Owner of both venues
    designer@gloaming.test   Designer at Hollow Pines Trail, crew at the Night Gallery
    manager@gloaming.test    Show manager at both venues
    crew@gloaming.test       Crew at Hollow Pines Trail

  Press Ctrl+C to stop everything.
`);
}
