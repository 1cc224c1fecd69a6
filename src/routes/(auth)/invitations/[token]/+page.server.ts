import { fail, redirect } from '@sveltejs/kit';
import { eq } from 'drizzle-orm';
import { z } from 'zod';
import { db } from '$lib/server/db';
import { users, venues } from '$lib/server/db/schema';
import { hashPassword } from '$lib/server/auth/password';
import { signInWithPassword } from '$lib/server/auth/sign-in';
import { keep, parseForm } from '$lib/server/forms';
import { MembershipError, acceptInvitation, findInvitation } from '$lib/server/venues/members';
import { newPasswordSchema, personNameSchema } from '$lib/schemas/auth';
import type { Actions, PageServerLoad } from './$types';

const STATUS_WORDS = {
	missing: 'This invitation link is not valid. Check that the whole link was copied.',
	accepted: 'This invitation has already been accepted.',
	revoked: 'This invitation was withdrawn by the venue owner.',
	expired: 'This invitation has expired. Ask the venue owner to invite you again.'
} as const;

// Public by design: the unguessable token in the link is the permission.
export const load: PageServerLoad = async ({ params, locals }) => {
	const found = await findInvitation(db, params.token);
	if (found.status !== 'open') return { status: found.status, problem: STATUS_WORDS[found.status] };
	const inv = found.invitation;
	const [venue] = await db
		.select({ name: venues.name, slug: venues.slug })
		.from(venues)
		.where(eq(venues.id, inv.venueId));
	const [existing] = await db
		.select({ id: users.id })
		.from(users)
		.where(eq(users.email, inv.email));
	return {
		status: 'open' as const,
		problem: null,
		invitation: { email: inv.email, role: inv.role, venueName: venue.name },
		hasAccount: !!existing,
		signedInAs: locals.person?.email ?? null
	};
};

const newAccountSchema = z
	.object({ name: personNameSchema, password: newPasswordSchema, confirm: z.string() })
	.refine((v) => v.password === v.confirm, {
		path: ['confirm'],
		message: 'The two passwords differ.'
	});

export const actions: Actions = {
	// Public by design: a signed-in person whose e-mail matches the invitation joins.
	join: async (event) => {
		const person = event.locals.person;
		if (!person) redirect(303, `/sign-in?redirectTo=${encodeURIComponent(event.url.pathname)}`);
		const found = await findInvitation(db, event.params.token);
		if (found.status !== 'open') return fail(400, { message: STATUS_WORDS[found.status] });
		if (found.invitation.email !== person.email) {
			return fail(403, {
				message: `This invitation is for ${found.invitation.email}. Sign out and sign in with that address.`
			});
		}
		try {
			await acceptInvitation(db, event.params.token, person.id);
		} catch (e) {
			if (e instanceof MembershipError) return fail(400, { message: e.message });
			throw e;
		}
		const [venue] = await db
			.select({ slug: venues.slug })
			.from(venues)
			.where(eq(venues.id, found.invitation.venueId));
		redirect(303, `/v/${venue.slug}`);
	},
	// Public by design: someone new sets a name and password; the link proved the address.
	create: async (event) => {
		const found = await findInvitation(db, event.params.token);
		if (found.status !== 'open') return fail(400, { message: STATUS_WORDS[found.status] });
		const parsed = await parseForm(event.request, newAccountSchema);
		if (!parsed.ok)
			return fail(400, { values: keep(parsed.raw, 'password', 'confirm'), errors: parsed.errors });
		const email = found.invitation.email;
		const [existing] = await db.select({ id: users.id }).from(users).where(eq(users.email, email));
		if (existing)
			return fail(400, { message: `There is already an account for ${email}. Sign in to accept.` });
		const [created] = await db
			.insert(users)
			.values({
				email,
				name: parsed.data.name,
				passwordHash: await hashPassword(parsed.data.password),
				emailVerified: new Date()
			})
			.returning({ id: users.id });
		try {
			await acceptInvitation(db, event.params.token, created.id);
		} catch (e) {
			if (e instanceof MembershipError) return fail(400, { message: e.message });
			throw e;
		}
		const [venue] = await db
			.select({ slug: venues.slug })
			.from(venues)
			.where(eq(venues.id, found.invitation.venueId));
		await signInWithPassword(event, email, parsed.data.password, `/v/${venue.slug}`);
		redirect(303, '/sign-in');
	}
};
