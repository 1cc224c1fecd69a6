import { index, integer, pgTable, primaryKey, text, timestamp } from 'drizzle-orm/pg-core';

// Tables the Auth.js Drizzle adapter reads and writes, plus our password hash on the person.
export const users = pgTable('users', {
	id: text('id')
		.primaryKey()
		.$defaultFn(() => crypto.randomUUID()),
	name: text('name'),
	email: text('email').notNull().unique(),
	emailVerified: timestamp('email_verified', { mode: 'date', withTimezone: true }),
	image: text('image'),
	passwordHash: text('password_hash'),
	createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow()
});

export const accounts = pgTable(
	'accounts',
	{
		userId: text('user_id')
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' }),
		type: text('type').$type<'email' | 'oauth' | 'oidc' | 'webauthn'>().notNull(),
		provider: text('provider').notNull(),
		providerAccountId: text('provider_account_id').notNull(),
		refresh_token: text('refresh_token'),
		access_token: text('access_token'),
		expires_at: integer('expires_at'),
		token_type: text('token_type'),
		scope: text('scope'),
		id_token: text('id_token'),
		session_state: text('session_state')
	},
	(t) => [primaryKey({ columns: [t.provider, t.providerAccountId] })]
);

/** One row per signed-in browser; session_token is the SHA-256 of the cookie's token. */
export const sessions = pgTable(
	'sessions',
	{
		sessionToken: text('session_token').primaryKey(),
		userId: text('user_id')
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' }),
		expires: timestamp('expires', { mode: 'date', withTimezone: true }).notNull()
	},
	(t) => [index('sessions_user').on(t.userId)]
);

export const verificationTokens = pgTable(
	'verification_tokens',
	{
		identifier: text('identifier').notNull(),
		token: text('token').notNull(),
		expires: timestamp('expires', { mode: 'date', withTimezone: true }).notNull()
	},
	(t) => [primaryKey({ columns: [t.identifier, t.token] })]
);

/**
 * One row per thing sign-in tries are counted against: a person's address or a client, for
 * passwords and for e-mailed links separately. `tries` counts tries since the row was last quiet
 * for a while; `open_at` is when the next try is let through (see src/lib/server/auth/limits.ts).
 */
export const signInLimits = pgTable(
	'sign_in_limits',
	{
		scope: text('scope')
			.$type<'password:client' | 'password:person' | 'link:client' | 'link:person'>()
			.notNull(),
		key: text('key').notNull(),
		tries: integer('tries').notNull().default(0),
		lastTryAt: timestamp('last_try_at', { withTimezone: true }).notNull().defaultNow(),
		openAt: timestamp('open_at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [
		primaryKey({ columns: [t.scope, t.key] }),
		index('sign_in_limits_last_try').on(t.lastTryAt)
	]
);
