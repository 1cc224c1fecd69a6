import { button, escapeHtml, frame } from './layout';

export interface InvitationData {
	url: string;
	venueName: string;
	roleLabel: string;
	invitedBy: string;
	expiresOn: string;
}

export function renderInvitation(d: InvitationData) {
	const subject = `You are invited to ${d.venueName} on Gloaming`;
	const html = frame(
		subject,
		`<p style="margin:0 0 12px;">${escapeHtml(d.invitedBy)} invited you to join <strong>${escapeHtml(d.venueName)}</strong> as <strong>${escapeHtml(d.roleLabel)}</strong>.</p>
${button(d.url, 'Accept the invitation')}
<p style="margin:0;color:#b2aad4;font-size:14px;">The invitation expires on ${escapeHtml(d.expiresOn)}.</p>`
	);
	const text = `${d.invitedBy} invited you to join ${d.venueName} on Gloaming as ${d.roleLabel}.

Accept the invitation: ${d.url}

The invitation expires on ${d.expiresOn}.
`;
	return { subject, html, text };
}
