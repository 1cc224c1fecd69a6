import { describe, expect, it } from 'vitest';
import { and, eq } from 'drizzle-orm';
import { auditLog, invitations, memberships } from '../../src/lib/server/db/schema';
import {
	MembershipError,
	acceptInvitation,
	changeRole,
	createInvitation,
	findInvitation,
	removeMember,
	revokeInvitation
} from '../../src/lib/server/venues/members';
import { makePerson, makeVenue, testDb } from './db';

const db = testDb();

describe('owners', () => {
	it('the last owner can be neither demoted nor removed', async () => {
		const owner = await makePerson(db);
		const {
			venue,
			memberships: [m]
		} = await makeVenue(db, [[owner.id, 'owner']]);
		await expect(changeRole(db, venue.id, m.id, 'crew', owner.id)).rejects.toThrow(MembershipError);
		await expect(removeMember(db, venue.id, m.id, owner.id)).rejects.toThrow(/at least one owner/);
		const [still] = await db.select().from(memberships).where(eq(memberships.id, m.id));
		expect(still.role).toBe('owner');
	});

	it('with a second owner, one can step down, and the change is audited', async () => {
		const a = await makePerson(db);
		const b = await makePerson(db);
		const {
			venue,
			memberships: [ma]
		} = await makeVenue(db, [
			[a.id, 'owner'],
			[b.id, 'owner']
		]);
		await changeRole(db, venue.id, ma.id, 'designer', b.id);
		const [after] = await db.select().from(memberships).where(eq(memberships.id, ma.id));
		expect(after.role).toBe('designer');
		const log = await db.select().from(auditLog).where(eq(auditLog.venueId, venue.id));
		expect(log.map((l) => l.action)).toContain('member.role_changed');
	});

	it('two owners demoting each other at once leave one owner', async () => {
		const a = await makePerson(db);
		const b = await makePerson(db);
		const {
			venue,
			memberships: [ma, mb]
		} = await makeVenue(db, [
			[a.id, 'owner'],
			[b.id, 'owner']
		]);
		const results = await Promise.allSettled([
			changeRole(db, venue.id, ma.id, 'crew', b.id),
			changeRole(db, venue.id, mb.id, 'crew', a.id)
		]);
		expect(results.filter((r) => r.status === 'fulfilled')).toHaveLength(1);
		const owners = await db
			.select()
			.from(memberships)
			.where(and(eq(memberships.venueId, venue.id), eq(memberships.role, 'owner')));
		expect(owners).toHaveLength(1);
	});

	it('cannot change a membership of another venue', async () => {
		const a = await makePerson(db);
		const b = await makePerson(db);
		const { venue } = await makeVenue(db, [[a.id, 'owner']]);
		const other = await makeVenue(db, [
			[b.id, 'owner'],
			[a.id, 'crew']
		]);
		await expect(changeRole(db, venue.id, other.memberships[1].id, 'owner', a.id)).rejects.toThrow(
			/not a member of this venue/
		);
	});
});

describe('invitations', () => {
	it('stores only a hash of the token, and accepting joins the venue once', async () => {
		const owner = await makePerson(db);
		const guest = await makePerson(db);
		const { venue } = await makeVenue(db, [[owner.id, 'owner']]);
		const { token } = await createInvitation(db, venue.id, guest.email, 'designer', owner.id);
		const stored = await db.select().from(invitations).where(eq(invitations.venueId, venue.id));
		expect(stored).toHaveLength(1);
		expect(stored[0].tokenHash).not.toContain(token);
		expect(stored[0].tokenHash).toMatch(/^[0-9a-f]{64}$/);

		expect((await findInvitation(db, token)).status).toBe('open');
		await acceptInvitation(db, token, guest.id);
		const [m] = await db
			.select()
			.from(memberships)
			.where(and(eq(memberships.venueId, venue.id), eq(memberships.personId, guest.id)));
		expect(m.role).toBe('designer');
		expect((await findInvitation(db, token)).status).toBe('accepted');
		await expect(acceptInvitation(db, token, guest.id)).rejects.toThrow(/no longer open/);
	});

	it('refuses expired and withdrawn invitations', async () => {
		const owner = await makePerson(db);
		const { venue } = await makeVenue(db, [[owner.id, 'owner']]);
		const old = new Date(Date.now() - 30 * 86_400_000);
		const expired = await createInvitation(
			db,
			venue.id,
			'late@gloaming.test',
			'crew',
			owner.id,
			old
		);
		expect((await findInvitation(db, expired.token)).status).toBe('expired');

		const fresh = await createInvitation(db, venue.id, 'maybe@gloaming.test', 'crew', owner.id);
		const [row] = await db
			.select()
			.from(invitations)
			.where(eq(invitations.email, 'maybe@gloaming.test'));
		await revokeInvitation(db, venue.id, row.id, owner.id);
		expect((await findInvitation(db, fresh.token)).status).toBe('revoked');
		expect((await findInvitation(db, 'no-such-token')).status).toBe('missing');
	});

	it('will not invite someone who is already a member', async () => {
		const owner = await makePerson(db);
		const { venue } = await makeVenue(db, [[owner.id, 'owner']]);
		await expect(createInvitation(db, venue.id, owner.email, 'crew', owner.id)).rejects.toThrow(
			/already a member/
		);
	});

	it('a new invitation replaces the open one for the same address', async () => {
		const owner = await makePerson(db);
		const { venue } = await makeVenue(db, [[owner.id, 'owner']]);
		const first = await createInvitation(db, venue.id, 'twice@gloaming.test', 'crew', owner.id);
		const second = await createInvitation(
			db,
			venue.id,
			'twice@gloaming.test',
			'designer',
			owner.id
		);
		expect((await findInvitation(db, first.token)).status).toBe('revoked');
		expect((await findInvitation(db, second.token)).status).toBe('open');
	});
});
