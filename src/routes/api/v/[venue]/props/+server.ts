import { json } from '@sveltejs/kit';
import { EDITORS, requireRole } from '$lib/server/auth/guard';
import { audit } from '$lib/server/audit';
import { db } from '$lib/server/db';
import { props } from '$lib/server/db/schema';
import { readJson } from '$lib/server/props/api';
import { listProps, ownsRefs } from '$lib/server/props/queries';
import { propQuerySchema, propSchema } from '$lib/schemas/prop';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	const venue = requireRole(event);
	const query = propQuerySchema.parse(Object.fromEntries(event.url.searchParams));
	return json({ ...(await listProps(db, venue.id, query)), page: query.page });
};

export const POST: RequestHandler = async (event) => {
	const venue = requireRole(event, ...EDITORS);
	const body = await readJson(event.request, propSchema);
	if (!body.ok) return body.response;
	const refErrors = await ownsRefs(db, venue.id, body.data);
	if (Object.keys(refErrors).length)
		return json({ message: 'Some fields need fixing.', errors: refErrors }, { status: 400 });
	const [row] = await db
		.insert(props)
		.values({ ...body.data, venueId: venue.id })
		.returning();
	await audit(db, {
		venueId: venue.id,
		personId: event.locals.person!.id,
		action: 'prop.added',
		detail: { name: row.name }
	});
	return json({ prop: row }, { status: 201 });
};
