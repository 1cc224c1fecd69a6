import { fail, isRedirect, redirect } from '@sveltejs/kit';
import { AuthError } from '@auth/sveltekit';
import { db } from '$lib/server/db';
import { forgiveSignInTry, takeSignInTry } from '$lib/server/auth/limits';
import { signInWith } from '$lib/server/auth/sign-in';
import { emailLinkSchema, passwordSignInSchema } from '$lib/schemas/auth';
import { keep, parseForm } from '$lib/server/forms';
import { safeRedirect } from '$lib/util/safe-redirect';
import type { Actions, PageServerLoad } from './$types';

// Public: the sign-in page itself.
export const load: PageServerLoad = ({ locals, url }) => {
	// Blank when none was asked for, so signing in lands where the person's venues say.
	const redirectTo = safeRedirect(url.searchParams.get('redirectTo'), { fallback: '' });
	if (locals.person) redirect(303, redirectTo || '/venues');
	// Auth.js sends people back here with ?error=… when an e-mail link is stale or used.
	const error = url.searchParams.get('error');
	return {
		redirectTo,
		linkProblem: error
			? 'That sign-in link has expired or was already used. Ask for a new one.'
			: null
	};
};

export const actions: Actions = {
	// Public: signing in is how a person becomes known.
	password: async (event) => {
		const parsed = await parseForm(event.request, passwordSignInSchema);
		if (!parsed.ok)
			return fail(400, {
				form: 'password',
				values: keep(parsed.raw, 'password'),
				errors: parsed.errors
			});
		const { email, password, redirectTo } = parsed.data;
		const client = event.getClientAddress();
		const taken = await takeSignInTry(db, 'password', email, client);
		if (!taken.ok)
			return fail(429, { form: 'password', values: { email }, message: taken.message });
		try {
			await signInWith(event, 'credentials', { email, password, redirectTo });
		} catch (e) {
			if (isRedirect(e)) {
				await forgiveSignInTry(db, 'password', email, client);
				throw e;
			}
			if (e instanceof AuthError) {
				return fail(400, {
					form: 'password',
					values: { email },
					message:
						'That e-mail address and password do not match. Check them, or ask for a sign-in link instead.'
				});
			}
			throw e;
		}
	},
	// Public: asks for a one-time link by e-mail.
	link: async (event) => {
		const parsed = await parseForm(event.request, emailLinkSchema);
		if (!parsed.ok)
			return fail(400, { form: 'link', values: keep(parsed.raw), errors: parsed.errors });
		const { email, redirectTo } = parsed.data;
		const taken = await takeSignInTry(db, 'link', email, event.getClientAddress());
		if (!taken.ok) return fail(429, { form: 'link', values: { email }, message: taken.message });
		try {
			await signInWith(event, 'nodemailer', { email, redirectTo });
		} catch (e) {
			if (isRedirect(e)) throw e;
			console.error('sign-in link could not be sent', e);
			return fail(503, {
				form: 'link',
				values: { email },
				message:
					'The sign-in link could not be sent just now. Try again in a minute, or use your password.'
			});
		}
	}
};
