import Invitation from './Invitation.svelte';
import { renderHtml } from './render';

export interface InvitationData {
	url: string;
	venueName: string;
	roleLabel: string;
	invitedBy: string;
	expiresOn: string;
}

export function renderInvitation(d: InvitationData) {
	const subject = `You are invited to ${d.venueName} on Gloaming`;
	const html = renderHtml(Invitation, { subject, d });
	const text = `${d.invitedBy} invited you to join ${d.venueName} on Gloaming as ${d.roleLabel}.

Accept the invitation: ${d.url}

The invitation expires on ${d.expiresOn}.
`;
	return { subject, html, text };
}
