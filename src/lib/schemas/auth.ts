import { z } from 'zod';
import { safeRedirect } from '$lib/util/safe-redirect';

export const emailField = z
	.string({ error: 'Enter your e-mail address.' })
	.trim()
	.toLowerCase()
	.min(1, 'Enter your e-mail address.')
	.max(254, 'That e-mail address is too long.')
	.email('That does not look like an e-mail address.');

/** Only same-site paths, so a crafted link cannot send people elsewhere after signing in. */
export const redirectToField = z
	.unknown()
	.optional()
	.transform((v) => safeRedirect(v));

export const passwordSignInSchema = z.object({
	email: emailField,
	password: z.string({ error: 'Enter your password.' }).min(1, 'Enter your password.').max(200),
	redirectTo: redirectToField
});

export const emailLinkSchema = z.object({
	email: emailField,
	redirectTo: redirectToField
});

export const newPasswordSchema = z
	.string({ error: 'Choose a password.' })
	.min(10, 'Use at least 10 characters.')
	.max(200, 'Use at most 200 characters.');

export const personNameSchema = z
	.string({ error: 'Enter your name.' })
	.trim()
	.min(1, 'Enter your name.')
	.max(100, 'Use at most 100 characters.');
