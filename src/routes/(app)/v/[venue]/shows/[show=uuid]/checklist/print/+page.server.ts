import { error } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { showAccess } from '$lib/server/checklists/access';
import { currentChecklist } from '$lib/server/checklists/copies';
import { localTime } from '$lib/util/when';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event);
	const access = await showAccess(db, venue, event.locals.person!.id, event.params.show);
	if (!access.ok) error(access.status, access.message);
	const s = access.show;
	// The server's kept copy of the checklist, as the crew page and the checks API read it.
	const checklist = (await currentChecklist(db, venue, s.id)).view;
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
