// Demo incidents on the demo season's opening night: a guest's grazed hand, still open with a
// follow-up note, and a show stop for a fog alarm, closed. No guest is named, as the form asks.
// Loaded once: a venue that already has incidents is left as it is.
import { and, eq } from 'drizzle-orm';
import { wallToInstant } from '../schedule';
import type { Db } from './db/client';
import { incidentEvents, incidents, rooms, seasons, shows, venues } from './db/schema';

export async function seedDemoIncidents(
	db: Db,
	venueSlug: string,
	seasonName: string,
	date: string,
	people: { crew: string; manager: string; owner: string }
) {
	const [venue] = await db
		.select({ id: venues.id, timeZone: venues.timeZone })
		.from(venues)
		.where(eq(venues.slug, venueSlug));
	if (!venue) return;
	const [already] = await db
		.select({ id: incidents.id })
		.from(incidents)
		.where(eq(incidents.venueId, venue.id))
		.limit(1);
	if (already) return;
	const [show] = await db
		.select({ id: shows.id })
		.from(shows)
		.innerJoin(seasons, eq(seasons.id, shows.seasonId))
		.where(and(eq(shows.venueId, venue.id), eq(seasons.name, seasonName), eq(shows.date, date)));
	if (!show) return;
	const roomId = async (name: string) =>
		(
			await db
				.select({ id: rooms.id })
				.from(rooms)
				.where(and(eq(rooms.venueId, venue.id), eq(rooms.name, name)))
		)[0]?.id ?? null;
	const at = (time: string) => wallToInstant(date, time, venue.timeZone);
	const venueId = venue.id;
	// Read before the transaction: the seed may run on a single connection.
	const walk = await roomId('Lantern Walk');
	const barn = await roomId('Hollow Barn');
	await db.transaction(async (tx) => {
		const [graze] = await tx
			.insert(incidents)
			.values({
				venueId,
				showId: show.id,
				roomId: walk,
				kind: 'guest_injury',
				happenedAt: at('20:12'),
				whatHappened:
					'A guest tripped on a tree root at the second lantern post and grazed a hand.',
				whatWasDone: 'Walked the group on; the guest sat at the first aid point for ten minutes.',
				firstAid: true,
				firstAidGiven: 'Cleaned the graze and put a plaster on it.',
				stoppedMinutes: 0,
				followUpBy: people.owner,
				personId: people.crew,
				reportedAt: at('20:20')
			})
			.returning();
		await tx.insert(incidentEvents).values({
			venueId,
			incidentId: graze.id,
			kind: 'follow_up',
			note: 'Root marked with reflective tape; the path edge will be raked before the next night.',
			personId: people.owner,
			at: at('23:30')
		});
		const [stop] = await tx
			.insert(incidents)
			.values({
				venueId,
				showId: show.id,
				roomId: barn,
				kind: 'show_stop',
				happenedAt: at('21:05'),
				whatHappened: 'The smoke detector in the barn loft went off while the fog scene ran.',
				whatWasDone:
					'Held the queue, brought the work lights up and cleared the barn until the alarm was reset.',
				firstAid: false,
				stoppedMinutes: 14,
				personId: people.manager,
				reportedAt: at('21:30')
			})
			.returning();
		await tx.insert(incidentEvents).values({
			venueId,
			incidentId: stop.id,
			kind: 'closed',
			note: 'Fog machine turned down and aimed away from the detector; no more alarms that night.',
			personId: people.manager,
			at: at('23:10')
		});
	});
}
