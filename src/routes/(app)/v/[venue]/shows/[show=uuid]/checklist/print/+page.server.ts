import { error } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { showAccess } from '$lib/server/checklists/access';
import { loadChecklist } from '$lib/server/checklists/state';
import { withFreshChecklist } from '$lib/server/checklists/sync';
import { localTime } from '$lib/util/when';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event);
	const access = await showAccess(db, venue, event.locals.person!.id, event.params.show);
	if (!access.ok) error(access.status, access.message);
	const s = access.show;
	const checklist = await withFreshChecklist(db, venue.id, s.id, () =>
		loadChecklist(db, venue, s.id)
	);
	return {
		show: {
			id: s.id,
			date: s.date,
			crewCall: localTime(s.crewCall, venue.timeZone, venue.clock),
			doorsOpen: localTime(s.doorsOpen, venue.timeZone, venue.clock)
		},
		checklist
	};
};
