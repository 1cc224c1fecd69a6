import { isRedirect, type RequestEvent } from '@sveltejs/kit';
import { AuthError } from '@auth/sveltekit';
import { signIn } from '../../../auth';

/**
 * Sign in with the credentials provider from server code (after accepting an invitation, say).
 * Returns false on wrong credentials; a successful sign-in throws SvelteKit's redirect.
 */
export async function signInWithPassword(
	event: RequestEvent,
	email: string,
	password: string,
	redirectTo: string
): Promise<false> {
	const body = new URLSearchParams({ providerId: 'credentials', email, password, redirectTo });
	// Keep the cookies; signIn rebuilds the request on ORIGIN, so the host headers do not matter.
	const headers = new Headers(event.request.headers);
	headers.set('content-type', 'application/x-www-form-urlencoded');
	headers.delete('content-length');
	const request = new Request(event.request.url, { method: 'POST', headers, body });
	try {
		await signIn({ ...event, request } as RequestEvent);
	} catch (e) {
		if (isRedirect(e)) throw e;
		if (e instanceof AuthError) return false;
		throw e;
	}
	return false;
}
