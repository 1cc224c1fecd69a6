import { error } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { visibleRunSheets } from '$lib/server/runsheets/access';
import { localDay } from '$lib/util/when';
import type { PageServerLoad } from './$types';
import { config } from '$lib/server/config';

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event);
	const { show, sheets, planner } = await visibleRunSheets(
		venue,
		event.locals.person!.id,
		event.params.show,
		config.origin
	);
	const sheet = sheets.find((s) => s.personId === event.params.person);
	if (!sheet) {
		if (!planner) error(403, 'You see your own run sheet only.');
		error(404, 'That person is not on the crew for this show.');
	}
	return {
		show: { id: show.id, date: show.date, dateLabel: localDay(show.date) },
		sheet: { personId: sheet.personId, name: sheet.name, data: sheet.data },
		canSeeAll: planner
	};
};
