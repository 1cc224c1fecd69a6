import { renderInvitation } from '$emails/invitation';
import { ROLE_LABELS, type Role } from '$lib/roles';
import { config } from '../config';
import { sendMail } from '../mail/transport';

export async function sendInvitationMail(o: {
	email: string;
	token: string;
	venueName: string;
	role: Role;
	invitedBy: string;
	expiresAt: Date;
}) {
	const url = new URL(`/invitations/${o.token}`, config.origin).toString();
	await sendMail(
		o.email,
		renderInvitation({
			url,
			venueName: o.venueName,
			roleLabel: ROLE_LABELS[o.role],
			invitedBy: o.invitedBy,
			expiresOn: o.expiresAt.toLocaleDateString('en-GB', {
				day: 'numeric',
				month: 'long',
				year: 'numeric'
			})
		})
	);
}
