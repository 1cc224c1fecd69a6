import type { Handle, RequestEvent } from '@sveltejs/kit';
import { SvelteKitAuth, type SvelteKitAuthConfig } from '@auth/sveltekit';
import Credentials from '@auth/sveltekit/providers/credentials';
import Nodemailer from '@auth/sveltekit/providers/nodemailer';
import { DrizzleAdapter } from '@auth/drizzle-adapter';
import { eq } from 'drizzle-orm';
import { z } from 'zod';
import { env } from '$env/dynamic/private';
import { renderSignInLink } from '$emails/sign-in-link';
import { db } from '$lib/server/db';
import { accounts, sessions, users, verificationTokens } from '$lib/server/db/schema';
import { verifyPassword } from '$lib/server/auth/password';
import {
	SESSION_IDLE_DAYS,
	endSession,
	findSession,
	sessionCookieName,
	sessionCookieOptions,
	startSession
} from '$lib/server/auth/sessions';
import { forgiveSignInTry, takeSignInTry } from '$lib/server/auth/limits';
import { config } from '$lib/server/config';
import { sendMail } from '$lib/server/mail/transport';
import { safeRedirect } from '$lib/util/safe-redirect';

const credentialsSchema = z.object({
	email: z.string().trim().toLowerCase().email(),
	password: z.string().min(1).max(200)
});

type Codec = NonNullable<SvelteKitAuthConfig['jwt']>;
type JWT = NonNullable<Awaited<ReturnType<NonNullable<Codec['decode']>>>>;

/** The session cookie carries only a random token that names a row in the sessions table. */
const sessionCodec = {
	async encode({ token }: { token?: JWT }) {
		if (typeof token?.sid !== 'string') throw new Error('A session cookie needs a session.');
		return token.sid;
	},
	async decode({ token }: { token?: string }): Promise<JWT | null> {
		const found = await findSession(db, token);
		if (!found || !token) return null;
		const { person } = found;
		return { sub: person.id, sid: token, email: person.email, name: person.name };
	}
};

function authConfig(): SvelteKitAuthConfig {
	const { host, port, secure } = config.smtp;
	const secureCookies = config.production;
	return {
		adapter: DrizzleAdapter(db, {
			usersTable: users,
			accountsTable: accounts,
			sessionsTable: sessions,
			verificationTokensTable: verificationTokens
		}),
		// Auth.js allows password sign-in only with its "jwt" sessions, so its token is reduced to
		// our session's random token (sessionCodec): every session is a row that can be ended.
		session: { strategy: 'jwt' as const, maxAge: SESSION_IDLE_DAYS * 24 * 60 * 60 },
		jwt: sessionCodec,
		cookies: {
			sessionToken: {
				name: sessionCookieName(secureCookies),
				options: sessionCookieOptions(secureCookies)
			}
		},
		secret: env.AUTH_SECRET,
		// The request's own host is never used: every request reaches Auth.js rebuilt on ORIGIN.
		trustHost: true,
		useSecureCookies: secureCookies,
		pages: { signIn: '/sign-in', verifyRequest: '/sign-in/check-email', error: '/sign-in' },
		providers: [
			Credentials({
				id: 'credentials',
				credentials: { email: {}, password: {} },
				async authorize(raw) {
					const parsed = credentialsSchema.safeParse(raw);
					if (!parsed.success) return null;
					const [person] = await db
						.select()
						.from(users)
						.where(eq(users.email, parsed.data.email))
						.limit(1);
					if (!person?.passwordHash) return null;
					if (!(await verifyPassword(person.passwordHash, parsed.data.password))) return null;
					return { id: person.id, email: person.email, name: person.name };
				}
			}),
			Nodemailer({
				id: 'nodemailer',
				server: { host, port, secure },
				from: config.mailFrom,
				normalizeIdentifier: (identifier) => identifier.trim().toLowerCase(),
				async sendVerificationRequest({ identifier, url }) {
					await sendMail(identifier, renderSignInLink({ url, email: identifier }));
				}
			})
		],
		callbacks: {
			// Every target Auth.js is given (the form's redirectTo, a Referer) stays on this site.
			redirect({ url, baseUrl }) {
				return new URL(safeRedirect(url, { origin: baseUrl, fallback: '/venues' }), baseUrl).href;
			},
			// Signing in (by password or link) starts a session row; its token becomes the cookie.
			async jwt({ token, user }) {
				if (user?.id) return { sub: user.id, sid: await startSession(db, user.id) };
				return token;
			},
			session({ session, token }) {
				if (token.sub) session.user.id = token.sub;
				return session;
			}
		},
		events: {
			// Both the sign-out form and Auth.js's own sign-out route pass through here.
			async signOut(message) {
				if ('token' in message && typeof message.token?.sid === 'string')
					await endSession(db, message.token.sid);
			}
		}
	};
}

let built: SvelteKitAuthConfig | null = null;
// Built once: the settings it reads do not change while the server runs.
const library = SvelteKitAuth(async () => (built ??= authConfig()));

/** Headers a client or proxy could use to make Auth.js build links on another host. */
const HOST_HEADERS = [
	'host',
	'x-forwarded-host',
	'x-forwarded-proto',
	'x-forwarded-port',
	'forwarded'
];

/**
 * The request as if it had come to the configured public address (ORIGIN): same path, query,
 * method, cookies and body, but the host and any forwarded-host headers replaced. Auth.js builds
 * sign-in links and redirects from the request, so it only ever sees requests made this way.
 */
export async function onPublicOrigin(request: Request): Promise<Request> {
	const origin = new URL(config.origin);
	const from = new URL(request.url);
	const headers = new Headers(request.headers);
	for (const name of HOST_HEADERS) headers.delete(name);
	headers.set('host', origin.host);
	const hasBody = request.method !== 'GET' && request.method !== 'HEAD';
	return new Request(new URL(from.pathname + from.search, origin), {
		method: request.method,
		headers,
		body: hasBody ? await request.arrayBuffer() : undefined
	});
}

function withRequest(event: RequestEvent, request: Request): RequestEvent {
	return { ...event, request, url: new URL(request.url) };
}

/**
 * What a POST to one of Auth.js's routes does, read the way Auth.js reads its paths. Only two
 * of them sign in or send a link, and both take a try from the sign-in limiter first; sign-out
 * is let through; any other POST (session updates, sign-in pages of providers we do not have)
 * is refused, so no other way in can open up behind the limiter's back.
 */
export function authPost(pathname: string): 'password' | 'link' | 'sign-out' | 'refused' {
	const [action, provider, ...rest] = pathname.slice('/auth'.length).split('/').filter(Boolean);
	if (rest.length) return 'refused';
	if (action === 'callback' && provider === 'credentials') return 'password';
	if (action === 'signin' && provider === 'nodemailer') return 'link';
	if (action === 'signout' && !provider) return 'sign-out';
	return 'refused';
}

/** The address a library route was given, as Auth.js will read it (JSON or a form). */
async function emailIn(request: Request): Promise<string | null> {
	const type = request.headers.get('content-type') ?? '';
	let email: unknown = null;
	try {
		if (type.includes('application/json')) email = (await request.clone().json())?.email;
		else if (type.includes('application/x-www-form-urlencoded'))
			email = new URLSearchParams(await request.clone().text()).get('email');
	} catch {
		// An unreadable body: Auth.js cannot read an address from it either.
	}
	return typeof email === 'string' && email.trim() ? email.trim().toLowerCase() : null;
}

/** True when Auth.js answered by setting a session cookie: someone signed in. */
function setsSession(response: Response) {
	return response.headers
		.getSetCookie()
		.some((line) => /session-token=[^;]/.test(line.split(';')[0]));
}

/** Auth.js's own routes under /auth: limited like the sign-in page, always on the public address. */
export const handle: Handle = async ({ event, resolve }) => {
	if (!event.url.pathname.startsWith('/auth/')) return library.handle({ event, resolve });
	const request = await onPublicOrigin(event.request);
	if (request.method !== 'POST')
		return library.handle({ event: withRequest(event, request), resolve });
	const what = authPost(event.url.pathname);
	if (what === 'refused') return new Response('Not found', { status: 404 });
	if (what === 'sign-out') return library.handle({ event: withRequest(event, request), resolve });
	const email = await emailIn(request);
	const client = event.getClientAddress();
	const taken = await takeSignInTry(db, what, email, client);
	if (!taken.ok) {
		return new Response(taken.message, {
			status: 429,
			headers: {
				'retry-after': String(taken.waitSeconds),
				'content-type': 'text/plain; charset=utf-8'
			}
		});
	}
	const response = await library.handle({ event: withRequest(event, request), resolve });
	if (what === 'password' && setsSession(response)) await forgiveSignInTry(db, what, email, client);
	return response;
};

/** Sign in from a form action (the form's fields are passed on to Auth.js). */
export async function signIn(event: RequestEvent) {
	return library.signIn(withRequest(event, await onPublicOrigin(event.request)));
}

export async function signOut(event: RequestEvent) {
	return library.signOut(withRequest(event, await onPublicOrigin(event.request)));
}
