import { and, eq } from 'drizzle-orm';
import type { Role } from '../roles';
import type { Db } from './db/client';
import { memberships, rooms, users, venues } from './db/schema';
import { hashPassword } from './auth/password';
import { seedDemoProps } from './demo-props';

// Gloaming's demo: two invented venues and four invented people, one per role.
export const DEMO_PASSWORD = 'lantern-demo-2026';

export const DEMO_PEOPLE = [
	{ key: 'owner', email: 'owner@gloaming.test', name: 'Odile Thistlewood' },
	{ key: 'designer', email: 'designer@gloaming.test', name: 'Tobin Ashgrove' },
	{ key: 'manager', email: 'manager@gloaming.test', name: 'Maren Quill' },
	{ key: 'crew', email: 'crew@gloaming.test', name: 'Sully Fenwick' }
] as const;

type PersonKey = (typeof DEMO_PEOPLE)[number]['key'];

export const DEMO_VENUES = [
	{
		slug: 'hollow-pines-trail',
		name: 'Hollow Pines Trail',
		kind: 'trail' as const,
		timeZone: 'America/New_York',
		address: 'Orchard Lane, Harrowgate Hills',
		defaultGroupSize: 8,
		dispatchIntervalSeconds: 120,
		safetyContactName: 'Maren Quill',
		safetyContactPhone: '+1 555 0142',
		rooms: ['Gatehouse', 'Lantern Walk', 'Hollow Barn', 'Bone Orchard', 'Exit Glade'],
		members: {
			owner: 'owner',
			designer: 'designer',
			manager: 'show_manager',
			crew: 'crew'
		} as Partial<Record<PersonKey, Role>>
	},
	{
		slug: 'marrowfield-night-gallery',
		name: 'Marrowfield Science Centre: Night Gallery',
		kind: 'exhibit' as const,
		timeZone: 'Europe/London',
		address: 'Marrowfield Science Centre, Quayside',
		defaultGroupSize: 12,
		dispatchIntervalSeconds: 60,
		safetyContactName: 'Odile Thistlewood',
		safetyContactPhone: '+44 7700 900311',
		rooms: ['Static Hall', 'Mirror Bay', 'Echo Tunnel'],
		// The designer is crew here: one person, a different role in each venue.
		members: { owner: 'owner', designer: 'crew', manager: 'show_manager' } as Partial<
			Record<PersonKey, Role>
		>
	}
];

/** Create or top up the demo data. Safe to run any number of times. */
export async function seedDemo(db: Db) {
	const passwordHash = await hashPassword(DEMO_PASSWORD);
	const ids = {} as Record<PersonKey, string>;
	for (const p of DEMO_PEOPLE) {
		const [row] = await db
			.insert(users)
			.values({ email: p.email, name: p.name, passwordHash, emailVerified: new Date() })
			.onConflictDoUpdate({ target: users.email, set: { name: p.name, passwordHash } })
			.returning({ id: users.id });
		ids[p.key] = row.id;
	}
	for (const { rooms: roomNames, members, ...v } of DEMO_VENUES) {
		await db.insert(venues).values(v).onConflictDoNothing({ target: venues.slug });
		const [venue] = await db.select({ id: venues.id }).from(venues).where(eq(venues.slug, v.slug));
		for (const [i, name] of roomNames.entries()) {
			await db
				.insert(rooms)
				.values({ venueId: venue.id, name, position: i + 1 })
				.onConflictDoNothing();
		}
		for (const [key, role] of Object.entries(members) as [PersonKey, Role][]) {
			const existing = await db
				.select({ id: memberships.id })
				.from(memberships)
				.where(and(eq(memberships.venueId, venue.id), eq(memberships.personId, ids[key])));
			if (!existing.length)
				await db.insert(memberships).values({ venueId: venue.id, personId: ids[key], role });
		}
		await seedDemoProps(db, venue.id, v.slug);
	}
	return ids;
}
