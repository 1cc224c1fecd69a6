import { fail } from '@sveltejs/kit';
import { eq } from 'drizzle-orm';
import { requireRole } from '$lib/server/auth/guard';
import { audit } from '$lib/server/audit';
import { db } from '$lib/server/db';
import { venues } from '$lib/server/db/schema';
import { keep, parseForm } from '$lib/server/forms';
import { venueSettingsSchema } from '$lib/schemas/venue';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event, 'owner');
	const [details] = await db.select().from(venues).where(eq(venues.id, venue.id));
	return { details };
};

export const actions: Actions = {
	save: async (event) => {
		const venue = requireRole(event, 'owner');
		const parsed = await parseForm(event.request, venueSettingsSchema);
		if (!parsed.ok) return fail(400, { values: keep(parsed.raw), errors: parsed.errors });
		await db.update(venues).set(parsed.data).where(eq(venues.id, venue.id));
		await audit(db, {
			venueId: venue.id,
			personId: event.locals.person!.id,
			action: 'venue.settings_changed',
			detail: { fields: Object.keys(parsed.data) }
		});
		return { saved: true };
	}
};
