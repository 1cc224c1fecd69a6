import { fail } from '@sveltejs/kit';
import { desc, eq } from 'drizzle-orm';
import { requireRole } from '$lib/server/auth/guard';
import { audit } from '$lib/server/audit';
import { db } from '$lib/server/db';
import { mailMessages, users } from '$lib/server/db/schema';
import { parseForm } from '$lib/server/forms';
import { findMail } from '$lib/server/mail/outbox';
import { resendMail } from '$lib/server/mail/queue';
import { MembershipError, isMemberAddress } from '$lib/server/venues/members';
import { resendInvitationMail } from '$lib/server/venues/invite-mail';
import { resendSchema } from '$lib/schemas/mail';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event, 'owner', 'show_manager');
	const messages = await db
		.select({
			id: mailMessages.id,
			kind: mailMessages.kind,
			recipient: mailMessages.recipient,
			subject: mailMessages.subject,
			status: mailMessages.status,
			attempts: mailMessages.attempts,
			lastError: mailMessages.lastError,
			queuedAt: mailMessages.queuedAt,
			sentAt: mailMessages.sentAt,
			resendOf: mailMessages.resendOf,
			attachments: mailMessages.attachments,
			queuedBy: users.name,
			queuedByEmail: users.email
		})
		.from(mailMessages)
		.leftJoin(users, eq(users.id, mailMessages.queuedBy))
		.where(eq(mailMessages.venueId, venue.id))
		.orderBy(desc(mailMessages.queuedAt), desc(mailMessages.id))
		.limit(200);
	return {
		messages: messages.map(({ attachments, ...m }) => ({
			...m,
			attachments: attachments.map((a) => a.filename)
		}))
	};
};

export const actions: Actions = {
	resend: async (event) => {
		const venue = requireRole(event, 'owner', 'show_manager');
		const person = event.locals.person!;
		const parsed = await parseForm(event.request, resendSchema);
		if (!parsed.ok) return fail(400, { message: 'That message does not exist.' });
		const original = await findMail(db, venue.id, parsed.data.id);
		if (!original) return fail(400, { message: 'That message does not exist.' });
		// Re-sending an invitation issues a new link to join the venue: that stays with owners.
		if (original.kind === 'invitation' && venue.role !== 'owner')
			return fail(403, { message: 'Only an owner can send an invitation again.' });
		// Venue mail goes only to people who still belong to the venue.
		if (
			original.kind !== 'invitation' &&
			!(await isMemberAddress(db, venue.id, original.recipient))
		)
			return fail(400, {
				message: `${original.recipient} no longer belongs to this venue, so the message was not sent again.`
			});
		let fresh;
		try {
			fresh =
				original.kind === 'invitation'
					? await resendInvitationMail(db, venue, original, person)
					: await resendMail(db, original, person.id);
		} catch (e) {
			if (e instanceof MembershipError) return fail(400, { message: e.message });
			console.error('re-send failed', e);
			return fail(503, {
				message: `The e-mail to ${original.recipient} could not be queued again. Try again in a minute.`
			});
		}
		await audit(db, {
			venueId: venue.id,
			personId: person.id,
			action: 'mail.resent',
			detail: { to: original.recipient, subject: original.subject }
		});
		return { resentTo: fresh.recipient };
	}
};
