import { error } from '@sveltejs/kit';
import { and, eq } from 'drizzle-orm';
import type { Db } from '$lib/server/db/client';
import { outputs } from '$lib/server/db/schema';
import { getController, getProp, isUuid } from './queries';

/** An output of a prop in this venue, with its controller, or a 404. */
export async function findOutput(db: Db, venueId: string, propId: string, outputId: string) {
	const prop = await getProp(db, venueId, propId);
	if (!prop || !isUuid(outputId)) error(404, 'There is no such output in this venue.');
	const [output] = await db
		.select()
		.from(outputs)
		.where(
			and(eq(outputs.id, outputId), eq(outputs.venueId, venueId), eq(outputs.propId, prop.id))
		);
	if (!output) error(404, 'There is no such output in this venue.');
	const controller = await getController(db, venueId, prop.controllerId);
	return { prop, output, controller };
}
