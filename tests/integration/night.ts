import type { Role } from '../../src/lib/roles';
import type { Db } from '../../src/lib/server/db/client';
import {
	assignments,
	outputs,
	positions,
	props,
	rooms,
	sceneResponses,
	scenes,
	sensors,
	shows
} from '../../src/lib/server/db/schema';
import { makePerson, makeVenue } from './db';

export const band = {
	direction: 'up' as const,
	enter: 1495,
	exit: 1487.5,
	baselineLow: 1472.5,
	baselineHigh: 1487.5
};

/** A venue with a Well room (the Well prop's plate drives its glow scene), a Barn with a pneumatic
 * drop in no scene yet, two shows and a room tech on the first. */
export async function makeNight(db: Db) {
	const manager = await makePerson(db, 'Ada Manager');
	const crewHere = await makePerson(db, 'Bo Crew');
	const crewOther = await makePerson(db, 'Cy Crew');
	const { venue } = await makeVenue(db, [
		[manager.id, 'show_manager'],
		[crewHere.id, 'crew'],
		[crewOther.id, 'crew']
	]);
	const [room] = await db
		.insert(rooms)
		.values({ venueId: venue.id, name: 'Well room', position: 1 })
		.returning();
	const [barn] = await db
		.insert(rooms)
		.values({ venueId: venue.id, name: 'Barn', position: 2 })
		.returning();
	const [well] = await db
		.insert(props)
		.values({ venueId: venue.id, name: 'Well', roomId: room.id, status: 'show_ready' })
		.returning();
	const [plate] = await db
		.insert(sensors)
		.values({
			venueId: venue.id,
			propId: well.id,
			kind: 'capacitive',
			name: 'Plate',
			settings: {
				kind: 'capacitive',
				resistanceOhm: 1e6,
				plateAreaCm2: 100,
				gapMm: 10,
				strayPf: 10,
				samplesAveraged: 4,
				readingNoiseCounts: 2,
				handFraction: 0.5
			},
			calibration: { ...band, captureId: null, appliedAt: new Date().toISOString() }
		})
		.returning();
	const [glow] = await db
		.insert(outputs)
		.values({
			venueId: venue.id,
			propId: well.id,
			kind: 'led_string',
			name: 'Glow',
			settings: {
				kind: 'led_string',
				colour: 'white',
				forwardV: 3.2,
				ledsInSeries: 3,
				strings: 1,
				currentMa: 20,
				supplyV: 12,
				switchDropV: 0.1,
				logicHighV: 5,
				gateThresholdMaxV: 2.5,
				continuousDrainMa: 200
			},
			safeState: 'full'
		})
		.returning();
	const [drop] = await db
		.insert(props)
		.values({ venueId: venue.id, name: 'Drop', roomId: barn.id, status: 'show_ready' })
		.returning();
	const [valve] = await db
		.insert(outputs)
		.values({
			venueId: venue.id,
			propId: drop.id,
			kind: 'relay',
			relayKind: 'pneumatic',
			name: 'Valve',
			settings: {
				kind: 'relay',
				relayKind: 'pneumatic',
				coilV: 5,
				coilOhm: 70,
				loadSupply: 'dc',
				loadV: 12,
				loadCurrentA: 0.4,
				contactRatingA: 10,
				contactRatingV: 30,
				onMs: 250,
				minOnMs: 50,
				offMs: 1500,
				minOffMs: 200
			},
			safeState: 'de_energised'
		})
		.returning();
	const [glowScene] = await db
		.insert(scenes)
		.values({
			venueId: venue.id,
			roomId: room.id,
			name: 'Glow',
			trigger: 'sensor',
			triggerSensorId: plate.id,
			lengthMs: 5000
		})
		.returning();
	await db
		.insert(sceneResponses)
		.values({ venueId: venue.id, sceneId: glowScene.id, sensorId: plate.id, outputId: glow.id });
	const when = (d: string) => ({
		venueId: venue.id,
		date: d,
		doorsOpen: new Date(`${d}T18:00:00Z`),
		doorsClose: new Date(`${d}T22:00:00Z`),
		crewCall: new Date(`${d}T16:00:00Z`)
	});
	const [show] = await db.insert(shows).values(when('2027-10-01')).returning();
	const [other] = await db.insert(shows).values(when('2027-10-02')).returning();
	const [post] = await db
		.insert(positions)
		.values({ venueId: venue.id, name: 'Room tech' })
		.returning();
	await db.insert(assignments).values([
		{ venueId: venue.id, showId: show.id, positionId: post.id, personId: crewHere.id },
		{ venueId: venue.id, showId: other.id, positionId: post.id, personId: crewOther.id }
	]);
	const ctx = (role: Role) => ({ id: venue.id, slug: venue.slug, role });
	return {
		venue,
		ctx,
		manager,
		crewHere,
		crewOther,
		show,
		other,
		well,
		drop,
		plate,
		valve,
		room,
		barn
	};
}
