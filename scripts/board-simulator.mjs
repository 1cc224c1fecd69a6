// @ts-check
// Plays the demo venues' boards: for each controller with sensors it takes a board key (reusing the
// one it made before, kept in .data/, while the key is still in force), then publishes readings to
// the broker once a second as a real board would: quiet idle readings with noise, and now and then
// someone arriving (a hand on the plate, a body through the beam) for a couple of seconds.
//
//   node scripts/board-simulator.mjs [--venue <slug>]... [--seconds N] [--keys <file>]
//
// Needs DATABASE_URL (to find the boards and make their keys) and MQTT_URL. `npm start` runs it
// after the app is up unless GLOAMING_SIMULATOR=0.
import { createHash, randomBytes } from 'node:crypto';
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname } from 'node:path';
import { parseArgs } from 'node:util';
import mqtt from 'mqtt';
import postgres from 'postgres';

const DEMO_VENUES = ['hollow-pines-trail', 'marrowfield-night-gallery'];
/** Readings per second per sensor, and how often a message goes out. */
const RATE_HZ = 10;
const SEND_EVERY_MS = 1000;
/** On average one arrival per board in this many seconds; each lasts about this long. */
const ARRIVAL_EVERY_S = 25;
const ARRIVAL_S = 2.5;

const { values } = parseArgs({
	options: {
		venue: { type: 'string', multiple: true },
		seconds: { type: 'string' },
		keys: { type: 'string', default: '.data/simulator-keys.json' }
	}
});
const venues = values.venue?.length ? values.venue : DEMO_VENUES;
const seconds = values.seconds ? Number(values.seconds) : Infinity;
const keysFile = /** @type {string} */ (values.keys);

const log = (/** @type {string} */ line) => console.log(`[simulator] ${line}`);

const databaseUrl = process.env.DATABASE_URL;
const mqttUrl = process.env.MQTT_URL;
if (!databaseUrl || !mqttUrl) {
	console.error('[simulator] needs DATABASE_URL and MQTT_URL');
	process.exit(2);
}

// The same token scheme as src/lib/server/boards/keys.ts: 'glb_' and 32 random bytes, SHA-256 stored.
const PREFIX = 'glb_';
const hash = (/** @type {string} */ t) => createHash('sha256').update(t).digest('hex');

/** @returns {Record<string, string>} controller id → token */
function readKeys() {
	try {
		return JSON.parse(readFileSync(keysFile, 'utf8'));
	} catch {
		return {};
	}
}

const sql = postgres(databaseUrl, { max: 2, onnotice: () => {} });

/**
 * @typedef {{ id: string, name: string, kind: string, settings: any, near: number | null,
 *   far: number | null, calibration: any }} SensorRow
 * @typedef {{ id: string, name: string, venueId: string, token: string, sensors: SensorRow[] }} Board
 */

/** The boards to play, each with a key in force. @returns {Promise<Board[]>} */
async function boards() {
	const rows = await sql`
		select c.id as controller_id, c.name as controller_name, c.venue_id, v.name as venue_name,
			s.id, s.name, s.kind, s.settings, s.near, s.far, s.calibration
		from controllers c
		join venues v on v.id = c.venue_id
		join props p on p.controller_id = c.id and p.venue_id = c.venue_id
		join sensors s on s.prop_id = p.id and s.venue_id = c.venue_id
		where v.slug in ${sql(venues)}
		order by c.name, s.name`;
	/** @type {Map<string, Board>} */
	const byId = new Map();
	for (const r of rows) {
		const b = byId.get(r.controller_id) ?? {
			id: r.controller_id,
			name: `${r.controller_name} (${r.venue_name})`,
			venueId: r.venue_id,
			token: '',
			sensors: []
		};
		b.sensors.push({
			id: r.id,
			name: r.name,
			kind: r.kind,
			settings: r.settings,
			near: r.near,
			far: r.far,
			calibration: r.calibration
		});
		byId.set(r.controller_id, b);
	}
	const keys = readKeys();
	for (const b of byId.values()) {
		const known = keys[b.id];
		if (known) {
			const [inForce] = await sql`
				select 1 from board_keys
				where token_hash = ${hash(known)} and controller_id = ${b.id} and revoked_at is null`;
			if (inForce) {
				b.token = known;
				continue;
			}
		}
		const token = PREFIX + randomBytes(32).toString('base64url');
		await sql`
			insert into board_keys (venue_id, controller_id, token_hash, hint)
			values (${b.venueId}, ${b.id}, ${hash(token)}, ${token.slice(0, PREFIX.length + 6)})`;
		keys[b.id] = token;
		b.token = token;
		log(`made a board key for ${b.name}`);
	}
	mkdirSync(dirname(keysFile), { recursive: true });
	writeFileSync(keysFile, JSON.stringify(keys, null, '\t'), { mode: 0o600 });
	return [...byId.values()];
}

/** A standard normal number (Box-Muller). */
function gauss() {
	const u = 1 - Math.random();
	const v = Math.random();
	return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
}

/** Idle and present readings of a sensor, and the noise on them. @param {SensorRow} s */
function model(s) {
	const cal = s.calibration;
	if (cal && Number.isFinite(cal.baselineLow) && Number.isFinite(cal.baselineHigh)) {
		const idle = (cal.baselineLow + cal.baselineHigh) / 2;
		const present = s.near ?? cal.enter + (cal.enter - idle);
		return { idle, present, noise: (cal.baselineHigh - cal.baselineLow) / 8, digital: false };
	}
	if (s.near !== null && s.far !== null)
		return { idle: s.far, present: s.near, noise: Math.abs(s.near - s.far) / 40, digital: false };
	switch (s.kind) {
		case 'capacitive':
			return { idle: 1000, present: 1080, noise: 2, digital: false };
		case 'ranging': {
			// Millimetres to whatever stands at the end of its range, and to a visitor leaning in.
			const far = Math.round((s.settings?.maxRangeM ?? 1) * 1000 * 0.9);
			return { idle: far, present: Math.round(far * 0.3), noise: 4, digital: false };
		}
		default:
			// Beam broken, movement seen, mat stepped on, button pressed: 1; otherwise 0.
			return { idle: 0, present: 1, noise: 0, digital: true };
	}
}

/** One board's loop: returns a stop function. @param {Board} b @param {import('mqtt').MqttClient} client */
function play(b, client) {
	const topic = `gloaming/${b.id}/readings`;
	const models = b.sensors.map((s) => ({ s, m: model(s), short: shortName(s.name) }));
	let arrival = { sensor: -1, from: 0, until: 0 };
	let sent = 0;
	const timer = setInterval(() => {
		const now = Date.now();
		if (arrival.until < now && Math.random() < SEND_EVERY_MS / 1000 / ARRIVAL_EVERY_S)
			arrival = {
				sensor: Math.floor(Math.random() * models.length),
				from: now,
				until: now + ARRIVAL_S * 1000
			};
		const readings = [];
		const step = 1000 / RATE_HZ;
		for (const [i, { m, short }] of models.entries())
			for (let k = 0; k < (SEND_EVERY_MS / 1000) * RATE_HZ; k++) {
				const at = now - SEND_EVERY_MS + (k + 1) * step;
				const present = i === arrival.sensor && at >= arrival.from && at < arrival.until;
				// The hand comes in and goes out over a third of a second rather than all at once.
				const into = present
					? Math.min(1, (at - arrival.from + step) / 300, (arrival.until - at) / 300)
					: 0;
				const base = m.idle + (m.present - m.idle) * into;
				const reading = m.digital
					? present
						? 1
						: 0
					: Number((base + gauss() * m.noise).toFixed(2));
				readings.push({
					sensor: short,
					seq: Math.round(at),
					reading,
					...(present ? { label: 'someone' } : {})
				});
			}
		client.publish(topic, JSON.stringify({ key: b.token, readings }), { qos: 1 });
		sent += readings.length;
	}, SEND_EVERY_MS);
	return () => {
		clearInterval(timer);
		return sent;
	};
}

/** As src/lib/boards/wire.ts shortName. @param {string} name */
function shortName(name) {
	return name
		.toLowerCase()
		.replace(/[^\p{L}\p{N}]+/gu, '-')
		.replace(/^-|-$/g, '');
}

const list = await boards();
if (!list.length) {
	log(`no controllers with sensors in ${venues.join(', ')}; nothing to play`);
	await sql.end();
	process.exit(0);
}
const client = await mqtt.connectAsync(mqttUrl, {
	clientId: `gloaming-simulator-${process.pid}`,
	reconnectPeriod: 2000
});
client.on('error', (e) => log(`broker: ${e.message}`));
await sql.end();
const stops = list.map((b) => play(b, client));
log(
	`playing ${list.length} board${list.length === 1 ? '' : 's'} (${list
		.map((b) => `${b.name}: ${b.sensors.length} sensor${b.sensors.length === 1 ? '' : 's'}`)
		.join('; ')}) on ${mqttUrl}`
);

let stopping = false;
async function stop() {
	if (stopping) return;
	stopping = true;
	const sent = stops.reduce((n, s) => n + s(), 0);
	await client.endAsync();
	log(`stopped after sending ${sent} readings`);
	process.exit(0);
}
process.on('SIGINT', stop);
process.on('SIGTERM', stop);
if (Number.isFinite(seconds)) setTimeout(stop, seconds * 1000);
