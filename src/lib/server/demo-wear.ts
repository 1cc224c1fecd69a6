// Demo rated lives on the demo season's pneumatic valve and fog machine, so their output pages
// show a wear counter. Loaded once: a venue that already has wear settings is left as it is.
import { and, eq, inArray } from 'drizzle-orm';
import type { Db } from './db/client';
import { outputs, venues, wearSettings } from './db/schema';

/** Output name → its demo setting; figures are common practice, no published source. */
const DEMO: Record<
	string,
	{ kind: 'seal_cycles' | 'fog_hours'; ratedLife: number; interval: number }
> = {
	'Drop valve': { kind: 'seal_cycles', ratedLife: 5_000_000, interval: 500_000 },
	'Fog machine': { kind: 'fog_hours', ratedLife: 2000, interval: 40 }
};

export async function seedDemoWear(db: Db, venueSlug: string, designer: string) {
	const [venue] = await db.select({ id: venues.id }).from(venues).where(eq(venues.slug, venueSlug));
	if (!venue) return;
	const [already] = await db
		.select({ id: wearSettings.id })
		.from(wearSettings)
		.where(eq(wearSettings.venueId, venue.id))
		.limit(1);
	if (already) return;
	const found = await db
		.select({ id: outputs.id, name: outputs.name })
		.from(outputs)
		.where(and(eq(outputs.venueId, venue.id), inArray(outputs.name, Object.keys(DEMO))));
	if (!found.length) return;
	await db
		.insert(wearSettings)
		.values(
			found.map((o) => ({ venueId: venue.id, outputId: o.id, personId: designer, ...DEMO[o.name] }))
		);
}
