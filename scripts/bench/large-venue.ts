// Benchmark data, not demo data: `node --import tsx scripts/bench/large-venue.ts [props] [scenes] [per]`.
// Adds one invented venue the size of a large attraction to the database in DATABASE_URL: `props`
// props (2,000 by default) with a sensor and an output each, in 20 rooms, and `scenes` scenes (200)
// each using `per` props (3), all running on one show tonight; the demo show manager and crew
// member belong to it and the crew member works the show. Prints the venue's slug and the show's id
// as JSON. Loading it twice adds nothing the second time.
import { eq } from 'drizzle-orm';
import { createDb } from '../../src/lib/server/db/client';
import { isLocalDatabaseUrl } from '../../src/lib/server/db/local';
import {
	assignments,
	memberships,
	outputs,
	positions,
	props,
	rooms,
	sceneCues,
	sceneResponses,
	scenes,
	seasons,
	sensors,
	shows,
	users,
	venues
} from '../../src/lib/server/db/schema';

const SLUG = 'bench-barrow-fields';
const [propCount, sceneCount, perScene] = [2000, 200, 3].map((d, i) =>
	Number(process.argv[2 + i] ?? d)
);

const url = process.env.DATABASE_URL;
if (!url || !isLocalDatabaseUrl(url))
	throw new Error('Benchmark data goes only into a local database.');
const { db, sql } = createDb(url, { max: 1 });

const led = {
	kind: 'led_string' as const,
	colour: 'white' as const,
	forwardV: 3.2,
	ledsInSeries: 3,
	strings: 1,
	currentMa: 20,
	supplyV: 12,
	switchDropV: 0.1,
	logicHighV: 5,
	gateThresholdMaxV: 2.5,
	continuousDrainMa: 200
};
const plate = {
	kind: 'capacitive' as const,
	resistanceOhm: 1e6,
	plateAreaCm2: 100,
	gapMm: 10,
	strayPf: 10,
	samplesAveraged: 4,
	readingNoiseCounts: 2,
	handFraction: 0.5
};

/** Inserts in slices, so no statement passes PostgreSQL's parameter limit. */
async function insertAll<T, R>(rows: T[], insert: (part: T[]) => Promise<R[]>): Promise<R[]> {
	const out: R[] = [];
	for (let i = 0; i < rows.length; i += 500) out.push(...(await insert(rows.slice(i, i + 500))));
	return out;
}

const [existing] = await db.select().from(venues).where(eq(venues.slug, SLUG));
let venueId = existing?.id;
let showId: string | undefined;
let seasonId: string | null | undefined;
if (existing) {
	[{ id: showId, seasonId }] = await db
		.select({ id: shows.id, seasonId: shows.seasonId })
		.from(shows)
		.where(eq(shows.venueId, existing.id));
} else {
	const people = await db.select({ id: users.id, email: users.email }).from(users);
	const person = (email: string) => {
		const p = people.find((x) => x.email === email);
		if (!p) throw new Error(`Load the demo data first: ${email} is missing.`);
		return p.id;
	};
	await db.transaction(async (tx) => {
		const [venue] = await tx
			.insert(venues)
			.values({
				name: 'Barrow Fields Scare Park',
				slug: SLUG,
				kind: 'haunt',
				timeZone: 'Europe/London'
			})
			.returning();
		venueId = venue.id;
		await tx.insert(memberships).values([
			{ venueId: venue.id, personId: person('manager@gloaming.test'), role: 'show_manager' },
			{ venueId: venue.id, personId: person('crew@gloaming.test'), role: 'crew' }
		]);
		const roomRows = await tx
			.insert(rooms)
			.values(
				Array.from({ length: 20 }, (_, i) => ({
					venueId: venue.id,
					name: `Room ${i + 1}`,
					position: i + 1
				}))
			)
			.returning();
		const propRows = await insertAll(
			Array.from({ length: propCount }, (_, i) => ({
				venueId: venue.id,
				name: `Prop ${String(i + 1).padStart(4, '0')}`,
				roomId: roomRows[i % roomRows.length].id
			})),
			(part) => tx.insert(props).values(part).returning()
		);
		const sensorRows = await insertAll(
			propRows.map((p) => ({
				venueId: venue.id,
				propId: p.id,
				kind: 'capacitive' as const,
				name: 'Plate',
				settings: plate
			})),
			(part) => tx.insert(sensors).values(part).returning()
		);
		const outputRows = await insertAll(
			propRows.map((p) => ({
				venueId: venue.id,
				propId: p.id,
				kind: 'led_string' as const,
				name: 'Glow',
				settings: led,
				safeState: 'full' as const
			})),
			(part) => tx.insert(outputs).values(part).returning()
		);
		const sceneRows = await insertAll(
			Array.from({ length: sceneCount }, (_, i) => ({
				venueId: venue.id,
				roomId: roomRows[i % roomRows.length].id,
				name: `Scene ${String(i + 1).padStart(3, '0')}`,
				lengthMs: 5000
			})),
			(part) => tx.insert(scenes).values(part).returning()
		);
		const uses = sceneRows.flatMap((s, i) =>
			Array.from({ length: perScene }, (_, j) => ({ s, k: (i * perScene + j) % propRows.length }))
		);
		await insertAll(
			uses.map(({ s, k }) => ({
				venueId: venue.id,
				sceneId: s.id,
				outputId: outputRows[k].id,
				startMs: 0,
				action: { type: 'set' as const, level: 0.5 }
			})),
			(part) => tx.insert(sceneCues).values(part).returning({ id: sceneCues.id })
		);
		await insertAll(
			uses.map(({ s, k }) => ({
				venueId: venue.id,
				sceneId: s.id,
				sensorId: sensorRows[k].id,
				outputId: outputRows[k].id
			})),
			(part) => tx.insert(sceneResponses).values(part).returning({ id: sceneResponses.id })
		);
		// Crew call an hour from now, doors an hour later: tonight's show.
		const start = Date.now() + 3_600_000;
		const date = new Date(start).toISOString().slice(0, 10);
		const [season] = await tx
			.insert(seasons)
			.values({
				venueId: venue.id,
				name: 'Bench season',
				firstNight: date,
				rule: 'FREQ=DAILY;COUNT=1',
				doorsOpen: '19:00',
				doorsClose: '23:00',
				crewCallMinutesBefore: 60
			})
			.returning();
		seasonId = season.id;
		const [show] = await tx
			.insert(shows)
			.values({
				venueId: venue.id,
				seasonId: season.id,
				date,
				crewCall: new Date(start),
				doorsOpen: new Date(start + 3_600_000),
				doorsClose: new Date(start + 5 * 3_600_000)
			})
			.returning();
		showId = show.id;
		const [post] = await tx
			.insert(positions)
			.values({ venueId: venue.id, name: 'Room tech', required: true })
			.returning();
		await tx.insert(assignments).values({
			venueId: venue.id,
			showId: show.id,
			positionId: post.id,
			personId: person('crew@gloaming.test')
		});
	});
}
// One prop and its sensor, for the sensor page and its live API.
const [first] = await db
	.select({ propId: sensors.propId, sensorId: sensors.id })
	.from(sensors)
	.where(eq(sensors.venueId, venueId!))
	.limit(1);
await sql.end();
console.log(
	JSON.stringify({
		slug: SLUG,
		venueId,
		showId,
		seasonId,
		propId: first?.propId,
		sensorId: first?.sensorId,
		props: propCount,
		scenes: sceneCount,
		perScene
	})
);
