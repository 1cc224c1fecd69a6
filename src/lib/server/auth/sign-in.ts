import { isRedirect, type RequestEvent } from '@sveltejs/kit';
import { AuthError } from '@auth/sveltekit';
import { signIn } from '../../../auth';

/**
 * Hand a sign-in to Auth.js from server code with exactly these fields: the provider is ours to
 * choose, never a field the client posted (a password form posting `providerId=nodemailer` must
 * not send e-mail outside the link limits). A successful sign-in throws SvelteKit's redirect.
 */
export async function signInWith(
	event: RequestEvent,
	providerId: 'credentials' | 'nodemailer',
	fields: Record<string, string>
) {
	const body = new URLSearchParams({ ...fields, providerId });
	// Keep the cookies; signIn rebuilds the request on ORIGIN, so the host headers do not matter.
	const headers = new Headers(event.request.headers);
	headers.set('content-type', 'application/x-www-form-urlencoded');
	headers.delete('content-length');
	const request = new Request(event.request.url, { method: 'POST', headers, body });
	await signIn({ ...event, request } as RequestEvent);
}

/**
 * Sign in with a password just set (after accepting an invitation, say). Returns false on wrong
 * credentials; a successful sign-in throws SvelteKit's redirect.
 */
export async function signInWithPassword(
	event: RequestEvent,
	email: string,
	password: string,
	redirectTo: string
): Promise<false> {
	try {
		await signInWith(event, 'credentials', { email, password, redirectTo });
	} catch (e) {
		if (isRedirect(e)) throw e;
		if (e instanceof AuthError) return false;
		throw e;
	}
	return false;
}
