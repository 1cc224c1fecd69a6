import { json } from '@sveltejs/kit';
import { and, eq } from 'drizzle-orm';
import { EDITORS, requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { props } from '$lib/server/db/schema';
import { readJson } from '$lib/server/props/api';
import { getProp, ownsRefs } from '$lib/server/props/queries';
import { propChildren } from '$lib/server/props/records';
import { propSchema } from '$lib/schemas/prop';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	const venue = requireRole(event);
	const prop = await getProp(db, venue.id, event.params.prop);
	if (!prop) return json({ message: 'There is no such prop.' }, { status: 404 });
	const { sensors, outputs, files } = await propChildren(db, venue.id, prop.id);
	return json({ prop, sensors, outputs, files: files.map(({ objectKey: _key, ...f }) => f) });
};

export const PUT: RequestHandler = async (event) => {
	const venue = requireRole(event, ...EDITORS);
	const prop = await getProp(db, venue.id, event.params.prop);
	if (!prop) return json({ message: 'There is no such prop.' }, { status: 404 });
	const body = await readJson(event.request, propSchema);
	if (!body.ok) return body.response;
	const refErrors = await ownsRefs(db, venue.id, body.data);
	if (Object.keys(refErrors).length)
		return json({ message: 'Some fields need fixing.', errors: refErrors }, { status: 400 });
	const [row] = await db
		.update(props)
		.set({ ...body.data, updatedAt: new Date() })
		.where(and(eq(props.id, prop.id), eq(props.venueId, venue.id)))
		.returning();
	return json({ prop: row });
};
