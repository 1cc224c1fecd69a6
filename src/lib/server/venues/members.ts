import { createHash, randomBytes } from 'node:crypto';
import { and, count, eq, isNull, gt, asc, inArray, ne, sql } from 'drizzle-orm';
import type { Role } from '$lib/roles';
import type { Db } from '../db/client';
import {
	assignments,
	calendarFeeds,
	invitations,
	mailMessages,
	memberships,
	shows,
	users
} from '../db/schema';
import { audit } from '../audit';
import { endSessionsOf } from '../auth/sessions';

export const INVITATION_DAYS = 14;

export class MembershipError extends Error {}

export function hashToken(token: string) {
	return createHash('sha256').update(token).digest('hex');
}

export function listMembers(db: Db, venueId: string) {
	return db
		.select({
			id: memberships.id,
			personId: users.id,
			name: users.name,
			email: users.email,
			role: memberships.role,
			since: memberships.createdAt
		})
		.from(memberships)
		.innerJoin(users, eq(users.id, memberships.personId))
		.where(eq(memberships.venueId, venueId))
		.orderBy(asc(users.name), asc(users.email));
}

export function listOpenInvitations(db: Db, venueId: string, now = new Date()) {
	return db
		.select({
			id: invitations.id,
			email: invitations.email,
			role: invitations.role,
			createdAt: invitations.createdAt,
			expiresAt: invitations.expiresAt
		})
		.from(invitations)
		.where(
			and(
				eq(invitations.venueId, venueId),
				isNull(invitations.acceptedAt),
				isNull(invitations.revokedAt),
				gt(invitations.expiresAt, now)
			)
		)
		.orderBy(asc(invitations.createdAt));
}

async function ownerCount(db: Pick<Db, 'select'>, venueId: string) {
	const [row] = await db
		.select({ n: count() })
		.from(memberships)
		.where(and(eq(memberships.venueId, venueId), eq(memberships.role, 'owner')));
	return row.n;
}

type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

/** How much a role sees of a venue: a change to a lower one takes away what it no longer may. */
const REACH: Record<Role, number> = { crew: 0, designer: 1, show_manager: 2, owner: 3 };

/**
 * What a person stops getting when they leave a venue or move to a role that sees less: their
 * nights still to come in it (past ones stay on record), its mail still waiting to go to them, and
 * on leaving, their calendar link for it. Feeds and run sheets also check membership and role on
 * every request; this makes the change last even if they come back.
 */
async function endVenueAccess(
	tx: Tx,
	venueId: string,
	personId: string,
	why: 'left' | 'role',
	now = new Date()
) {
	const upcoming = tx
		.select({ id: shows.id })
		.from(shows)
		.where(and(eq(shows.venueId, venueId), gt(shows.doorsClose, now)));
	await tx
		.delete(assignments)
		.where(
			and(
				eq(assignments.venueId, venueId),
				eq(assignments.personId, personId),
				inArray(assignments.showId, upcoming)
			)
		);
	const [person] = await tx
		.select({ email: users.email })
		.from(users)
		.where(eq(users.id, personId));
	if (person)
		await tx
			.update(mailMessages)
			.set({
				status: 'withdrawn',
				lastError:
					why === 'left'
						? 'Not sent: they left the venue before it went.'
						: 'Not sent: their role changed before it went.'
			})
			.where(
				and(
					eq(mailMessages.venueId, venueId),
					eq(mailMessages.status, 'queued'),
					ne(mailMessages.kind, 'invitation'),
					sql`lower(${mailMessages.recipient}) = lower(${person.email})`
				)
			);
	if (why === 'left')
		await tx
			.delete(calendarFeeds)
			.where(and(eq(calendarFeeds.personId, personId), eq(calendarFeeds.venueId, venueId)));
}

/** True when the address belongs to a member of the venue (mail for the venue may go to it). */
export async function isMemberAddress(db: Db, venueId: string, email: string) {
	const rows = await db
		.select({ id: memberships.id })
		.from(memberships)
		.innerJoin(users, eq(users.id, memberships.personId))
		.where(
			and(eq(memberships.venueId, venueId), sql`lower(${users.email}) = lower(${email.trim()})`)
		);
	return rows.length > 0;
}

/**
 * Change a member's role; the last owner cannot stop being one. A role that sees less ends their
 * nights to come and withdraws the venue's mail still waiting for them.
 */
export async function changeRole(
	db: Db,
	venueId: string,
	membershipId: string,
	role: Role,
	actorId: string
) {
	await db.transaction(async (tx) => {
		// Lock the venue's memberships so two owners demoting each other cannot both succeed.
		const rows = await tx
			.select()
			.from(memberships)
			.where(eq(memberships.venueId, venueId))
			.for('update');
		const target = rows.find((m) => m.id === membershipId);
		if (!target) throw new MembershipError('That person is not a member of this venue.');
		if (target.role === role) return;
		if (target.role === 'owner' && rows.filter((m) => m.role === 'owner').length === 1) {
			throw new MembershipError(
				'A venue needs at least one owner. Make someone else an owner first.'
			);
		}
		await tx.update(memberships).set({ role }).where(eq(memberships.id, membershipId));
		if (REACH[role] < REACH[target.role])
			await endVenueAccess(tx, venueId, target.personId, 'role');
		await audit(tx, {
			venueId,
			personId: actorId,
			action: 'member.role_changed',
			detail: { personId: target.personId, from: target.role, to: role }
		});
	});
}

/**
 * Remove a member; the last owner cannot be removed. Their nights to come, the venue's mail still
 * waiting for them and their calendar link for the venue end with the membership, and when it was
 * their last venue, so do their sessions.
 */
export async function removeMember(db: Db, venueId: string, membershipId: string, actorId: string) {
	await db.transaction(async (tx) => {
		const rows = await tx
			.select()
			.from(memberships)
			.where(eq(memberships.venueId, venueId))
			.for('update');
		const target = rows.find((m) => m.id === membershipId);
		if (!target) throw new MembershipError('That person is not a member of this venue.');
		if (target.role === 'owner' && rows.filter((m) => m.role === 'owner').length === 1) {
			throw new MembershipError(
				'A venue needs at least one owner. Make someone else an owner first.'
			);
		}
		await tx.delete(memberships).where(eq(memberships.id, membershipId));
		await endVenueAccess(tx, venueId, target.personId, 'left');
		// Removed from their last venue: nothing is left to be signed in for, so their sessions end.
		const [elsewhere] = await tx
			.select({ id: memberships.id })
			.from(memberships)
			.where(eq(memberships.personId, target.personId))
			.limit(1);
		if (!elsewhere) await endSessionsOf(tx, target.personId);
		await audit(tx, {
			venueId,
			personId: actorId,
			action: 'member.removed',
			detail: { personId: target.personId, role: target.role }
		});
	});
}

/** Create an invitation; returns the one-time token for the e-mail link (only its hash is stored). */
export async function createInvitation(
	db: Db,
	venueId: string,
	email: string,
	role: Role,
	actorId: string,
	now = new Date()
) {
	const [existing] = await db
		.select({ id: memberships.id })
		.from(memberships)
		.innerJoin(users, eq(users.id, memberships.personId))
		.where(and(eq(memberships.venueId, venueId), eq(users.email, email)));
	if (existing) throw new MembershipError(`${email} is already a member of this venue.`);
	const token = randomBytes(32).toString('base64url');
	const expiresAt = new Date(now.getTime() + INVITATION_DAYS * 86_400_000);
	const id = await db.transaction(async (tx) => {
		// A new invitation replaces any open one for the same address.
		await tx
			.update(invitations)
			.set({ revokedAt: now })
			.where(
				and(
					eq(invitations.venueId, venueId),
					eq(invitations.email, email),
					isNull(invitations.acceptedAt),
					isNull(invitations.revokedAt)
				)
			);
		const [row] = await tx
			.insert(invitations)
			.values({
				venueId,
				email,
				role,
				tokenHash: hashToken(token),
				invitedBy: actorId,
				expiresAt
			})
			.returning({ id: invitations.id });
		await audit(tx, {
			venueId,
			personId: actorId,
			action: 'invitation.sent',
			detail: { email, role }
		});
		return row.id;
	});
	return { id, token, expiresAt };
}

/**
 * A fresh token for an open invitation (for re-sending its e-mail): the old link stops working,
 * and the expiry starts again. Only the hash is stored, so a re-send cannot reuse the old link.
 */
export async function renewInvitationToken(
	db: Db,
	venueId: string,
	invitationId: string,
	now = new Date()
) {
	const token = randomBytes(32).toString('base64url');
	const expiresAt = new Date(now.getTime() + INVITATION_DAYS * 86_400_000);
	const [row] = await db
		.update(invitations)
		.set({ tokenHash: hashToken(token), expiresAt })
		.where(
			and(
				eq(invitations.id, invitationId),
				eq(invitations.venueId, venueId),
				isNull(invitations.acceptedAt),
				isNull(invitations.revokedAt)
			)
		)
		.returning();
	if (!row)
		throw new MembershipError(
			'That invitation has been accepted or withdrawn, so its e-mail cannot be sent again. Invite the person again instead.'
		);
	return { invitation: row, token, expiresAt };
}

export async function revokeInvitation(
	db: Db,
	venueId: string,
	invitationId: string,
	actorId: string
) {
	const done = await db
		.update(invitations)
		.set({ revokedAt: new Date() })
		.where(
			and(
				eq(invitations.id, invitationId),
				eq(invitations.venueId, venueId),
				isNull(invitations.acceptedAt)
			)
		)
		.returning({ email: invitations.email });
	if (!done.length) throw new MembershipError('That invitation is no longer open.');
	await audit(db, {
		venueId,
		personId: actorId,
		action: 'invitation.revoked',
		detail: { email: done[0].email }
	});
}

/** Find an open invitation by its token. */
export async function findInvitation(db: Db, token: string, now = new Date()) {
	const [inv] = await db
		.select()
		.from(invitations)
		.where(eq(invitations.tokenHash, hashToken(token)))
		.limit(1);
	if (!inv) return { status: 'missing' as const };
	if (inv.acceptedAt) return { status: 'accepted' as const, invitation: inv };
	if (inv.revokedAt) return { status: 'revoked' as const, invitation: inv };
	if (inv.expiresAt <= now) return { status: 'expired' as const, invitation: inv };
	return { status: 'open' as const, invitation: inv };
}

/** Accept an open invitation for a person: joins the venue (or keeps an existing membership). */
export async function acceptInvitation(db: Db, token: string, personId: string, now = new Date()) {
	return db.transaction(async (tx) => {
		const [inv] = await tx
			.select()
			.from(invitations)
			.where(eq(invitations.tokenHash, hashToken(token)))
			.for('update');
		if (!inv || inv.acceptedAt || inv.revokedAt || inv.expiresAt <= now) {
			throw new MembershipError('This invitation is no longer open. Ask the owner for a new one.');
		}
		await tx
			.insert(memberships)
			.values({ venueId: inv.venueId, personId, role: inv.role })
			.onConflictDoNothing();
		await tx
			.update(invitations)
			.set({ acceptedAt: now, acceptedBy: personId })
			.where(eq(invitations.id, inv.id));
		await audit(tx, {
			venueId: inv.venueId,
			personId,
			action: 'invitation.accepted',
			detail: { email: inv.email, role: inv.role }
		});
		return inv;
	});
}

export { ownerCount };
