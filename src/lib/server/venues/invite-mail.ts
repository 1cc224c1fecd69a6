import { eq } from 'drizzle-orm';
import { renderInvitation } from '$emails/invitation';
import { ROLE_LABELS, type Role } from '$lib/roles';
import { localDayOf } from '$lib/util/when';
import { config } from '../config';
import type { Db } from '../db/client';
import { users } from '../db/schema';
import type { MailMessage } from '../mail/outbox';
import { queueMail, resendMail } from '../mail/queue';
import { renewInvitationToken } from './members';

function render(o: {
	token: string;
	venueName: string;
	role: Role;
	invitedBy: string;
	expiresAt: Date;
	/** The venue's zone: the day it runs out is that venue's day. */
	timeZone: string;
}) {
	const url = new URL(`/invitations/${o.token}`, config.origin).toString();
	return renderInvitation({
		url,
		venueName: o.venueName,
		roleLabel: ROLE_LABELS[o.role],
		invitedBy: o.invitedBy,
		expiresOn: localDayOf(o.expiresAt, o.timeZone)
	});
}

/** Queue the invitation e-mail; one per invitation and address. */
export async function queueInvitationMail(
	db: Db,
	o: {
		venueId: string;
		invitationId: string;
		email: string;
		token: string;
		venueName: string;
		role: Role;
		invitedBy: string;
		invitedById: string;
		expiresAt: Date;
		timeZone: string;
	}
) {
	return queueMail(db, {
		venueId: o.venueId,
		kind: 'invitation',
		subjectId: o.invitationId,
		recipient: o.email,
		...render(o),
		queuedBy: o.invitedById
	});
}

/** Re-send an invitation e-mail: the stored body is gone, so the link gets a fresh token. */
export async function resendInvitationMail(
	db: Db,
	venue: { name: string; timeZone: string },
	original: MailMessage,
	actor: { id: string; name: string | null; email: string }
) {
	return resendMail(db, original, actor.id, async () => {
		const { invitation, token, expiresAt } = await renewInvitationToken(
			db,
			original.venueId!,
			original.subjectId ?? ''
		);
		const [inviter] = invitation.invitedBy
			? await db.select().from(users).where(eq(users.id, invitation.invitedBy))
			: [];
		return render({
			token,
			venueName: venue.name,
			timeZone: venue.timeZone,
			role: invitation.role,
			invitedBy: inviter?.name ?? inviter?.email ?? actor.name ?? actor.email,
			expiresAt
		});
	});
}
