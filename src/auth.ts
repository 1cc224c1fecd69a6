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
import { config } from '$lib/server/config';
import { sendMail } from '$lib/server/mail/transport';
import { safeRedirect } from '$lib/util/safe-redirect';

const credentialsSchema = z.object({
	email: z.string().trim().toLowerCase().email(),
	password: z.string().min(1).max(200)
});

export const { handle, signIn, signOut } = SvelteKitAuth(async (): Promise<SvelteKitAuthConfig> => {
	const { host, port, secure } = config.smtp;
	return {
		adapter: DrizzleAdapter(db, {
			usersTable: users,
			accountsTable: accounts,
			sessionsTable: sessions,
			verificationTokensTable: verificationTokens
		}),
		// Password sign-in needs JWT sessions; the adapter still keeps people and e-mail tokens.
		session: { strategy: 'jwt' as const, maxAge: 30 * 24 * 60 * 60 },
		secret: env.AUTH_SECRET,
		trustHost: true,
		useSecureCookies: config.production,
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
			session({ session, token }) {
				if (token.sub) session.user.id = token.sub;
				return session;
			}
		}
	};
});
