import { error } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { showAccess } from '$lib/server/checklists/access';
import { loadChecklist } from '$lib/server/checklists/state';
import { withFreshChecklist } from '$lib/server/checklists/sync';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event);
	const access = await showAccess(db, venue, event.locals.person!.id, event.params.show);
	if (!access.ok) error(access.status, access.message);
	const checklist = await withFreshChecklist(db, venue.id, access.show.id, () =>
		loadChecklist(db, venue, access.show.id)
	);
	// The rooms of the person's posts tonight; none (every room) for a safety post or no room post.
	const posts = access.posts;
	const own = [
		...new Map(posts.flatMap((p) => (p.roomId && p.room ? [[p.roomId, p.room] as const] : [])))
	].map(([id, name]) => ({ id, name }));
	return {
		myRooms: own.length && !posts.some((p) => p.safetyPost) ? own : null,
		show: { id: access.show.id, date: access.show.date, status: access.show.status },
		checklist,
		manages: access.manages
	};
};
