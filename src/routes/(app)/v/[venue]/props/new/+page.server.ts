import { fail, redirect } from '@sveltejs/kit';
import { EDITORS, requireRole } from '$lib/server/auth/guard';
import { audit } from '$lib/server/audit';
import { db } from '$lib/server/db';
import { props } from '$lib/server/db/schema';
import { keep, parseForm } from '$lib/server/forms';
import { ownsRefs, venueControllers, venueRooms } from '$lib/server/props/queries';
import { propSchema } from '$lib/schemas/prop';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event, ...EDITORS);
	const [rooms, controllers] = await Promise.all([
		venueRooms(db, venue.id),
		venueControllers(db, venue.id)
	]);
	return { rooms, controllers: controllers.map((c) => ({ id: c.id, name: c.name })) };
};

export const actions: Actions = {
	default: async (event) => {
		const venue = requireRole(event, ...EDITORS);
		const parsed = await parseForm(event.request, propSchema);
		if (!parsed.ok) return fail(400, { values: keep(parsed.raw), errors: parsed.errors });
		const refErrors = await ownsRefs(db, venue.id, parsed.data);
		if (Object.keys(refErrors).length)
			return fail(400, { values: keep(parsed.raw), errors: refErrors });
		const [row] = await db
			.insert(props)
			.values({ ...parsed.data, venueId: venue.id })
			.returning({ id: props.id });
		await audit(db, {
			venueId: venue.id,
			personId: event.locals.person!.id,
			action: 'prop.added',
			detail: { name: parsed.data.name }
		});
		redirect(303, `/v/${venue.slug}/props/${row.id}`);
	}
};
