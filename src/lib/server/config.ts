import { env } from '$env/dynamic/private';

/** Read a required variable, failing loudly at start-up rather than on the first request. */
function required(name: string): string {
	const value = env[name];
	if (!value) throw new Error(`${name} is not set. See .env.example for what it means.`);
	return value;
}

export function checkConfig() {
	required('DATABASE_URL');
	required('AUTH_SECRET');
}

export const config = {
	get origin() {
		return env.ORIGIN ?? 'http://127.0.0.1:5510';
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
	get production() {
		return env.NODE_ENV === 'production' && !env.ORIGIN?.startsWith('http://127.0.0.1');
	}
};
