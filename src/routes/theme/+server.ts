import { redirect } from '@sveltejs/kit';
import { THEME_COOKIE } from '$lib/server/hooks/theme';
import { safeRedirect } from '$lib/util/safe-redirect';
import type { RequestHandler } from './$types';

// Public: stores a display preference only.
export const POST: RequestHandler = async ({ request, cookies, url }) => {
	const form = await request.formData().catch(() => null);
	const theme = form?.get('theme') === 'low-light' ? 'low-light' : 'dusk';
	cookies.set(THEME_COOKIE, theme, {
		path: '/',
		httpOnly: true,
		sameSite: 'lax',
		secure: url.protocol === 'https:',
		maxAge: 60 * 60 * 24 * 365
	});
	// Back to the page the person was on, when the Referer is a well-formed address on this site.
	redirect(303, safeRedirect(request.headers.get('referer'), { origin: url.origin }));
};
