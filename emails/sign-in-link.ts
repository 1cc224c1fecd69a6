import { button, escapeHtml, frame } from './layout';

export interface SignInLinkData {
	url: string;
	email: string;
}

export function renderSignInLink({ url, email }: SignInLinkData) {
	const subject = 'Your Gloaming sign-in link';
	const html = frame(
		subject,
		`<p style="margin:0 0 12px;">Use this link to sign in as ${escapeHtml(email)}. It works once and expires in 24 hours.</p>
${button(url, 'Sign in to Gloaming')}
<p style="margin:0;color:#b2aad4;font-size:14px;">If you did not ask for this, ignore this e-mail; nobody can sign in without the link.</p>`
	);
	const text = `Use this link to sign in to Gloaming as ${email}. It works once and expires in 24 hours.

${url}

If you did not ask for this, ignore this e-mail; nobody can sign in without the link.
`;
	return { subject, html, text };
}
