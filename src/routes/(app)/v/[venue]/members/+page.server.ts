import { fail } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { keep, parseForm } from '$lib/server/forms';
import {
	MembershipError,
	changeRole,
	createInvitation,
	listMembers,
	listOpenInvitations,
	removeMember,
	revokeInvitation
} from '$lib/server/venues/members';
import { queueInvitationMail } from '$lib/server/venues/invite-mail';
import {
	changeRoleSchema,
	invitationIdSchema,
	inviteSchema,
	memberIdSchema
} from '$lib/schemas/member';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event, 'owner');
	return {
		members: await listMembers(db, venue.id),
		invitations: await listOpenInvitations(db, venue.id)
	};
};

function refused(action: string, e: unknown) {
	if (e instanceof MembershipError) return fail(400, { action, message: e.message });
	throw e;
}

export const actions: Actions = {
	invite: async (event) => {
		const venue = requireRole(event, 'owner');
		const person = event.locals.person!;
		const parsed = await parseForm(event.request, inviteSchema);
		if (!parsed.ok)
			return fail(400, { action: 'invite', values: keep(parsed.raw), errors: parsed.errors });
		let created;
		try {
			created = await createInvitation(
				db,
				venue.id,
				parsed.data.email,
				parsed.data.role,
				person.id
			);
		} catch (e) {
			return refused('invite', e);
		}
		try {
			await queueInvitationMail(db, {
				...parsed.data,
				venueId: venue.id,
				invitationId: created.id,
				token: created.token,
				venueName: venue.name,
				timeZone: venue.timeZone,
				invitedBy: person.name ?? person.email,
				invitedById: person.id,
				expiresAt: created.expiresAt
			});
		} catch (e) {
			console.error('invitation e-mail could not be queued', e);
			return fail(503, {
				action: 'invite',
				values: keep(parsed.raw),
				message: `The invitation is saved, but the e-mail to ${parsed.data.email} could not be queued. Try inviting again in a minute.`
			});
		}
		return { action: 'invite', sentTo: parsed.data.email };
	},
	role: async (event) => {
		const venue = requireRole(event, 'owner');
		const parsed = await parseForm(event.request, changeRoleSchema);
		if (!parsed.ok) return fail(400, { action: 'role', message: 'Choose one of the four roles.' });
		try {
			await changeRole(db, venue.id, parsed.data.id, parsed.data.role, event.locals.person!.id);
		} catch (e) {
			return refused('role', e);
		}
		return { action: 'role', saved: true };
	},
	remove: async (event) => {
		const venue = requireRole(event, 'owner');
		const parsed = await parseForm(event.request, memberIdSchema);
		if (!parsed.ok) return fail(400, { action: 'remove', message: 'That member does not exist.' });
		try {
			await removeMember(db, venue.id, parsed.data.id, event.locals.person!.id);
		} catch (e) {
			return refused('remove', e);
		}
		return { action: 'remove', saved: true };
	},
	revoke: async (event) => {
		const venue = requireRole(event, 'owner');
		const parsed = await parseForm(event.request, invitationIdSchema);
		if (!parsed.ok)
			return fail(400, { action: 'revoke', message: 'That invitation does not exist.' });
		try {
			await revokeInvitation(db, venue.id, parsed.data.id, event.locals.person!.id);
		} catch (e) {
			return refused('revoke', e);
		}
		return { action: 'revoke', saved: true };
	}
};
