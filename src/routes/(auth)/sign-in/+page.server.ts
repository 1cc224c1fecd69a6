import { fail, isRedirect, redirect } from '@sveltejs/kit';
import { AuthError } from '@auth/sveltekit';
import { signIn } from '../../../auth';
import { db } from '$lib/server/db';
import { checkSignInAllowed, recordSignInAttempt } from '$lib/server/auth/rate-limit';
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

async function attempt(
	event: Parameters<Actions[string]>[0],
	method: 'password' | 'email-link',
	email: string
) {
	const address = event.getClientAddress();
	const allowed = await checkSignInAllowed(db, method, email, address);
	if (!allowed.allowed) return { limited: allowed.message, address };
	return { limited: null, address };
}

export const actions: Actions = {
	// Public: signing in is how a person becomes known.
	password: async (event) => {
		const parsed = await parseForm(event.request.clone(), passwordSignInSchema);
		if (!parsed.ok)
			return fail(400, {
				form: 'password',
				values: keep(parsed.raw, 'password'),
				errors: parsed.errors
			});
		const { email } = parsed.data;
		const { limited, address } = await attempt(event, 'password', email);
		if (limited) return fail(429, { form: 'password', values: { email }, message: limited });
		try {
			await signIn(event);
		} catch (e) {
			if (isRedirect(e)) {
				await recordSignInAttempt(db, 'password', email, address, true);
				throw e;
			}
			if (e instanceof AuthError) {
				await recordSignInAttempt(db, 'password', email, address, false);
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
		const parsed = await parseForm(event.request.clone(), emailLinkSchema);
		if (!parsed.ok)
			return fail(400, { form: 'link', values: keep(parsed.raw), errors: parsed.errors });
		const { email } = parsed.data;
		const { limited, address } = await attempt(event, 'email-link', email);
		if (limited) return fail(429, { form: 'link', values: { email }, message: limited });
		await recordSignInAttempt(db, 'email-link', email, address, true);
		try {
			await signIn(event);
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
