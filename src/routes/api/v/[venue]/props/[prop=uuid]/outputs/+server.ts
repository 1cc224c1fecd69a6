import { json } from '@sveltejs/kit';
import { EDITORS, requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { outputs } from '$lib/server/db/schema';
import { readJson } from '$lib/server/props/api';
import { getProp } from '$lib/server/props/queries';
import { outputValues, touchProp } from '$lib/server/props/records';
import { outputSchema } from '$lib/schemas/output';
import type { RequestHandler } from './$types';

/** Body: { name, safeState, settings: { kind: 'led_string' | 'relay', …that kind's fields } }. */
export const POST: RequestHandler = async (event) => {
	const venue = requireRole(event, ...EDITORS);
	const prop = await getProp(db, venue.id, event.params.prop);
	if (!prop) return json({ message: 'There is no such prop.' }, { status: 404 });
	const body = await readJson(event.request, outputSchema);
	if (!body.ok) return body.response;
	const values = outputValues(body.data);
	const [row] = await db
		.insert(outputs)
		.values({
			...values,
			curve: values.kind === 'led_string' ? { kind: 'cie' } : null,
			venueId: venue.id,
			propId: prop.id
		})
		.returning();
	await touchProp(db, venue.id, prop.id);
	return json({ output: row }, { status: 201 });
};
