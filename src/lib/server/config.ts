import { env } from '$env/dynamic/private';
import { dev } from '$app/environment';

/** Read a required variable, failing loudly at start-up rather than on the first request. */
function required(name: string): string {
	const value = env[name];
	if (!value) throw new Error(`${name} is not set. See .env.example for what it means.`);
	return value;
}

/** At start-up. A built server (`node build`) counts as production, as does NODE_ENV=production. */
export function checkConfig(built = !dev) {
	required('DATABASE_URL');
	required('AUTH_SECRET');
	if ((built || env.NODE_ENV === 'production') && !env.ORIGIN) {
		throw new Error(
			'ORIGIN is not set. In production every sign-in link, run sheet and calendar link is built ' +
				'from it, never from the request: set it to the address people open, such as https://gloaming.example.org.'
		);
	}
	if (env.ORIGIN) {
		let url: URL | null = null;
		try {
			url = new URL(env.ORIGIN);
		} catch {
			// reported below
		}
		if (!url || !/^https?:$/.test(url.protocol) || url.origin !== env.ORIGIN.replace(/\/$/, '')) {
			throw new Error(
				`ORIGIN must be just the public address, such as https://gloaming.example.org (it is ${env.ORIGIN}).`
			);
		}
	}
}

export const config = {
	get origin() {
		return (env.ORIGIN || 'http://127.0.0.1:5510').replace(/\/$/, '');
	},
	get mailFrom() {
		return env.MAIL_FROM ?? 'Gloaming <no-reply@gloaming.test>';
	},
	get smtp() {
		return {
			host: env.SMTP_HOST ?? '127.0.0.1',
			port: Number(env.SMTP_PORT ?? 2525),
			secure: env.SMTP_SECURE === 'true',
			user: env.SMTP_USER || undefined,
			password: env.SMTP_PASSWORD || undefined
		};
	},
	/** GLOAMING_OPEN_VENUES=yes: anyone signed in may create a venue, not only owners. */
	get openVenues() {
		return env.GLOAMING_OPEN_VENUES === 'yes';
	},
	/** Days of raw board readings kept (per-minute figures are kept for good): READINGS_RETENTION_DAYS. */
	get readingsRetentionDays() {
		const n = Number(env.READINGS_RETENTION_DAYS ?? 14);
		return Number.isInteger(n) && n >= 1 ? n : 14;
	},
	/** The MQTT broker the boards publish to; unset, the app does not listen. */
	get mqttUrl() {
		return env.MQTT_URL || null;
	},
	/**
	 * The broker address written into boards' firmware headers: BOARD_MQTT_URL when the boards
	 * reach the broker by another name than the app does, else MQTT_URL.
	 */
	get boardBroker(): { host: string; port: number } {
		const raw = env.BOARD_MQTT_URL || env.MQTT_URL || 'mqtt://127.0.0.1:1883';
		try {
			const u = new URL(raw);
			return { host: u.hostname, port: Number(u.port) || (u.protocol === 'mqtts:' ? 8883 : 1883) };
		} catch {
			return { host: '127.0.0.1', port: 1883 };
		}
	},
	get production() {
		return env.NODE_ENV === 'production' && !env.ORIGIN?.startsWith('http://127.0.0.1');
	}
};
