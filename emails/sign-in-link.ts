import { renderHtml } from './render';
import SignInLink from './SignInLink.svelte';

export interface SignInLinkData {
	url: string;
	email: string;
}

export function renderSignInLink({ url, email }: SignInLinkData) {
	const subject = 'Your Gloaming sign-in link';
	const html = renderHtml(SignInLink, { subject, url, email });
	const text = `Use this link to sign in to Gloaming as ${email}. It works once and expires in 24 hours.

${url}

If you did not ask for this, ignore this e-mail; nobody can sign in without the link.
`;
	return { subject, html, text };
}
