// Demo faults in the demo season's venue: one still open, one repaired, re-tested and closed.
// Loaded once: a venue that already has faults is left as it is.
import { asc, eq } from 'drizzle-orm';
import type { Db } from './db/client';
import { faultEvents, faults, props, venues } from './db/schema';

export async function seedDemoFaults(
	db: Db,
	venueSlug: string,
	people: { crew: string; designer: string; manager: string }
) {
	const [venue] = await db.select({ id: venues.id }).from(venues).where(eq(venues.slug, venueSlug));
	if (!venue) return;
	const [already] = await db
		.select({ id: faults.id })
		.from(faults)
		.where(eq(faults.venueId, venue.id))
		.limit(1);
	if (already) return;
	const list = await db
		.select({ id: props.id, roomId: props.roomId })
		.from(props)
		.where(eq(props.venueId, venue.id))
		.orderBy(asc(props.name))
		.limit(2);
	if (list.length < 2) return;
	const venueId = venue.id;
	const at = (hoursAgo: number) => new Date(Date.now() - hoursAgo * 3_600_000);
	await db.transaction(async (tx) => {
		const [open] = await tx
			.insert(faults)
			.values({
				venueId,
				propId: list[0].id,
				roomId: list[0].roomId,
				severity: 'degraded',
				seen: 'Flickers twice before it lights; the scene still plays.',
				personId: people.crew,
				reportedAt: at(3)
			})
			.returning();
		await tx.insert(faultEvents).values({
			venueId,
			faultId: open.id,
			kind: 'reported',
			personId: people.crew,
			at: open.reportedAt
		});
		const [closed] = await tx
			.insert(faults)
			.values({
				venueId,
				propId: list[1].id,
				roomId: list[1].roomId,
				severity: 'stops_scene',
				seen: 'Did not fire when the group walked past.',
				personId: people.crew,
				reportedAt: at(50)
			})
			.returning();
		await tx.insert(faultEvents).values([
			{ venueId, faultId: closed.id, kind: 'reported', personId: people.crew, at: at(50) },
			{
				venueId,
				faultId: closed.id,
				kind: 'repaired',
				action: 'Reseated the loose sensor plug and tied the lead back.',
				parts: 'One cable tie',
				minutes: 25,
				personId: people.designer,
				at: at(49)
			},
			{
				venueId,
				faultId: closed.id,
				kind: 'retested',
				passed: true,
				note: 'Fired ten walks in a row.',
				personId: people.crew,
				at: at(47.75)
			},
			{ venueId, faultId: closed.id, kind: 'closed', personId: people.manager, at: at(47.5) }
		]);
	});
}
