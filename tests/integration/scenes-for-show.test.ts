import { describe, expect, it } from 'vitest';
import { sceneChanges, scenes, showSceneExclusions, shows } from '../../src/lib/server/db/schema';
import { changesAfterSignOff, scenesForShow } from '../../src/lib/server/scenes/for-show';
import { makePerson, makeVenue, testDb } from './db';

const db = testDb();

async function setUp() {
	const person = await makePerson(db, 'Ivo Brack');
	const { venue } = await makeVenue(db, [[person.id, 'owner']]);
	const [show] = await db
		.insert(shows)
		.values({
			venueId: venue.id,
			date: '2027-10-01',
			doorsOpen: new Date('2027-10-01T18:00:00Z'),
			doorsClose: new Date('2027-10-01T22:00:00Z'),
			crewCall: new Date('2027-10-01T16:00:00Z')
		})
		.returning();
	const [glow, hiss, shelved] = await db
		.insert(scenes)
		.values([
			{ venueId: venue.id, name: 'Glow', lengthMs: 4000 },
			{ venueId: venue.id, name: 'Hiss', lengthMs: 2000 },
			{ venueId: venue.id, name: 'Shelved', lengthMs: 2000, runsOnShowNights: false }
		])
		.returning();
	return { person, venue, show, glow, hiss, shelved };
}

describe('the scenes of a night', () => {
	it('runs every scene marked for show nights, less the ones left out of this show', async () => {
		const { venue, show, glow, hiss } = await setUp();
		expect((await scenesForShow(db, venue.id, show.id)).map((s) => s.name)).toEqual([
			'Glow',
			'Hiss'
		]);
		await db
			.insert(showSceneExclusions)
			.values({ showId: show.id, sceneId: hiss.id, venueId: venue.id });
		const night = await scenesForShow(db, venue.id, show.id);
		expect(night.map((s) => s.id)).toEqual([glow.id]);
	});

	it('lists scene changes made after the sign-off, and only those', async () => {
		const { person, venue, show, glow, hiss, shelved } = await setUp();
		const signedAt = new Date('2027-10-01T17:30:00Z');
		await db.insert(sceneChanges).values([
			{
				venueId: venue.id,
				sceneId: glow.id,
				personId: person.id,
				summary: 'Before',
				at: new Date('2027-10-01T17:00:00Z')
			},
			{
				venueId: venue.id,
				sceneId: glow.id,
				personId: person.id,
				summary: 'After',
				at: new Date('2027-10-01T18:10:00Z')
			},
			{
				venueId: venue.id,
				sceneId: hiss.id,
				personId: person.id,
				summary: 'Later still',
				at: new Date('2027-10-01T19:00:00Z')
			},
			{
				venueId: venue.id,
				sceneId: shelved.id,
				personId: person.id,
				summary: 'Not tonight',
				at: new Date('2027-10-01T18:20:00Z')
			}
		]);
		const late = await changesAfterSignOff(db, venue.id, show.id, signedAt);
		expect(late.map((c) => [c.sceneName, c.summary])).toEqual([
			['Glow', 'After'],
			['Hiss', 'Later still']
		]);
		await db.insert(showSceneExclusions).values([
			{ showId: show.id, sceneId: glow.id, venueId: venue.id },
			{ showId: show.id, sceneId: hiss.id, venueId: venue.id }
		]);
		expect(await changesAfterSignOff(db, venue.id, show.id, signedAt)).toEqual([]);
	});
});
