import { describe, expect, it } from 'vitest';
import { and, eq, inArray } from 'drizzle-orm';
import {
	assignments,
	memberships,
	rooms,
	scenes,
	seasons,
	shows,
	users,
	venues
} from '../../src/lib/server/db/schema';
import { verifyPassword } from '../../src/lib/server/auth/password';
import {
	DEMO_PASSWORD,
	DEMO_PEOPLE,
	DEMO_SEASON,
	DEMO_VENUES,
	seedDemo
} from '../../src/lib/server/demo';
import { testDb } from './db';

const db = testDb();

describe('demo data', () => {
	it('is idempotent and gives one person a different role in each venue', async () => {
		await seedDemo(db);
		await seedDemo(db);
		const slugs = DEMO_VENUES.map((v) => v.slug);
		const vs = await db.select().from(venues).where(inArray(venues.slug, slugs));
		expect(vs).toHaveLength(2);
		expect(new Set(vs.map((v) => v.kind))).toEqual(new Set(['trail', 'exhibit']));
		const rs = await db
			.select()
			.from(rooms)
			.where(
				inArray(
					rooms.venueId,
					vs.map((v) => v.id)
				)
			);
		expect(rs).toHaveLength(DEMO_VENUES.reduce((n, v) => n + v.rooms.length, 0));

		const [designer] = await db
			.select()
			.from(users)
			.where(eq(users.email, 'designer@gloaming.test'));
		const roles = await db.select().from(memberships).where(eq(memberships.personId, designer.id));
		expect(roles.map((r) => r.role).sort()).toEqual(['crew', 'designer']);

		const people = await db
			.select()
			.from(users)
			.where(
				inArray(
					users.email,
					DEMO_PEOPLE.map((p) => p.email)
				)
			);
		expect(people).toHaveLength(4);
		for (const p of people) {
			expect(p.passwordHash).not.toContain(DEMO_PASSWORD);
			expect(await verifyPassword(p.passwordHash!, DEMO_PASSWORD)).toBe(true);
			expect(await verifyPassword(p.passwordHash!, 'wrong')).toBe(false);
		}
	});

	it('gives the trail one season of Friday and Saturday nights, once, with crew on opening night', async () => {
		await seedDemo(db);
		await seedDemo(db);
		const [trail] = await db.select().from(venues).where(eq(venues.slug, DEMO_SEASON.venueSlug));
		const list = await db.select().from(seasons).where(eq(seasons.venueId, trail.id));
		expect(list.filter((s) => s.name === DEMO_SEASON.name)).toHaveLength(1);
		const nights = await db.select().from(shows).where(eq(shows.seasonId, list[0].id));
		// October 2027 has 10 Fridays and Saturdays; the 16th is dark.
		expect(nights).toHaveLength(9);
		const opening = nights.find((n) => n.openingNight)!;
		expect(opening.date).toBe('2027-10-01');
		const crew = await db.select().from(assignments).where(eq(assignments.showId, opening.id));
		expect(crew).toHaveLength(4);
		// The demo scene for run sheets, once however often the seed runs.
		const demoScenes = await db
			.select()
			.from(scenes)
			.where(and(eq(scenes.venueId, trail.id), eq(scenes.name, 'Lantern walk')));
		expect(demoScenes).toHaveLength(1);
	});
});
