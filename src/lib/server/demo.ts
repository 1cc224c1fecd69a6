import { and, eq } from 'drizzle-orm';
import type { Role } from '../roles';
import type { Db } from './db/client';
import {
	assignments,
	memberships,
	positions,
	rooms,
	seasons,
	shows,
	users,
	venues
} from './db/schema';
import { regenerateShows } from './schedule/seasons';
import { hashPassword } from './auth/password';
import { seedDemoProps } from './demo-props';
import { seedLanternWalk } from './demo-lantern-walk';
import { seedDemoBaselines, seedDemoCalibration } from './demo-calibration';
import { seedDemoScenes } from './demo-scenes';
import { seedDemoFaults } from './demo-faults';
import { seedDemoIncidents } from './demo-incidents';
import { seedDemoWear } from './demo-wear';

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
		if (v.slug === 'hollow-pines-trail') await seedLanternWalk(db, venue.id);
		await seedDemoCalibration(db, venue.id, v.slug);
		await seedDemoScenes(db, venue.id, v.slug, ids.designer);
	}
	await seedSchedule(db, ids);
	await seedDemoBaselines(db, DEMO_SEASON.venueSlug);
	await seedDemoFaults(db, DEMO_SEASON.venueSlug, ids);
	await seedDemoIncidents(
		db,
		DEMO_SEASON.venueSlug,
		DEMO_SEASON.name,
		DEMO_SEASON.openingNight,
		ids
	);
	await seedDemoWear(db, DEMO_SEASON.venueSlug, ids.designer);
	return ids;
}

/** The trail's demo season: Friday and Saturday nights through October 2027, one dark night. */
export const DEMO_SEASON = {
	venueSlug: 'hollow-pines-trail',
	name: 'Hollow Pines Autumn 2027',
	firstNight: '2027-10-01',
	rule: 'FREQ=WEEKLY;BYDAY=FR,SA;UNTIL=20271031',
	doorsOpen: '19:00',
	doorsClose: '23:00',
	crewCallMinutesBefore: 120,
	darkNights: ['2027-10-16'],
	extraNights: [] as string[],
	openingNight: '2027-10-01'
};

async function seedSchedule(db: Db, ids: Record<PersonKey, string>) {
	const { venueSlug, ...fields } = DEMO_SEASON;
	const [venue] = await db
		.select({ id: venues.id, timeZone: venues.timeZone })
		.from(venues)
		.where(eq(venues.slug, venueSlug));
	const roomList = await db
		.select({ id: rooms.id, name: rooms.name })
		.from(rooms)
		.where(eq(rooms.venueId, venue.id));
	const posts = [
		...roomList.map((r) => ({
			name: `Room tech, ${r.name}`,
			roomId: r.id as string | null,
			required: true,
			safetyPost: false
		})),
		{ name: 'Queue line', roomId: null, required: true, safetyPost: false },
		{ name: 'Safety lead', roomId: null, required: true, safetyPost: true }
	];
	for (const p of posts) {
		await db
			.insert(positions)
			.values({ ...p, venueId: venue.id })
			.onConflictDoUpdate({
				target: [positions.venueId, positions.name],
				set: { safetyPost: p.safetyPost }
			});
	}
	let [season] = await db
		.select({ id: seasons.id })
		.from(seasons)
		.where(and(eq(seasons.venueId, venue.id), eq(seasons.name, fields.name)));
	if (!season) {
		[season] = await db
			.insert(seasons)
			.values({ ...fields, venueId: venue.id })
			.returning({ id: seasons.id });
		await regenerateShows(db, venue.id, season.id, venue.timeZone);
	}
	const [opening] = await db
		.select({ id: shows.id })
		.from(shows)
		.where(and(eq(shows.seasonId, season.id), eq(shows.date, fields.openingNight)));
	const postId = async (name: string) =>
		(
			await db
				.select({ id: positions.id })
				.from(positions)
				.where(and(eq(positions.venueId, venue.id), eq(positions.name, name)))
		)[0]?.id;
	const crewPlan: [PersonKey, string][] = [
		['crew', 'Room tech, Gatehouse'],
		['manager', 'Safety lead'],
		['designer', 'Room tech, Hollow Barn'],
		// Where the demo scene "Lantern walk" runs, so a run sheet shows scenes, cues and cautions.
		['owner', 'Room tech, Lantern Walk']
	];
	for (const [key, name] of crewPlan) {
		const positionId = await postId(name);
		if (!opening || !positionId) continue;
		await db
			.insert(assignments)
			.values({ venueId: venue.id, showId: opening.id, positionId, personId: ids[key] })
			.onConflictDoNothing();
	}
}
