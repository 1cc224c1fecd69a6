import { and, desc, eq, inArray } from 'drizzle-orm';
import { referencedIds } from '$lib/activity';
import { requireRole } from '$lib/server/auth/guard';
import { db } from '$lib/server/db';
import { auditLog, props, scenes, shows, users } from '$lib/server/db/schema';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event, 'owner');
	const entries = await db
		.select({
			id: auditLog.id,
			at: auditLog.at,
			action: auditLog.action,
			detail: auditLog.detail,
			who: users.name,
			whoEmail: users.email
		})
		.from(auditLog)
		.leftJoin(users, eq(users.id, auditLog.personId))
		.where(eq(auditLog.venueId, venue.id))
		.orderBy(desc(auditLog.at), desc(auditLog.id))
		.limit(200);

	// The people, shows, scenes and props the entries name, looked up together.
	const ids = {
		people: new Set<string>(),
		shows: new Set<string>(),
		scenes: new Set<string>(),
		props: new Set<string>()
	};
	for (const e of entries) {
		const r = referencedIds(e.action, e.detail);
		for (const key of ['people', 'shows', 'scenes', 'props'] as const)
			for (const id of r[key]) ids[key].add(id);
	}
	const [people, showRows, sceneRows, propRows] = await Promise.all([
		ids.people.size
			? db
					.select({ id: users.id, name: users.name, email: users.email })
					.from(users)
					.where(inArray(users.id, [...ids.people]))
			: [],
		ids.shows.size
			? db
					.select({ id: shows.id, date: shows.date })
					.from(shows)
					.where(and(eq(shows.venueId, venue.id), inArray(shows.id, [...ids.shows])))
			: [],
		ids.scenes.size
			? db
					.select({ id: scenes.id, name: scenes.name })
					.from(scenes)
					.where(and(eq(scenes.venueId, venue.id), inArray(scenes.id, [...ids.scenes])))
			: [],
		ids.props.size
			? db
					.select({ id: props.id, name: props.name })
					.from(props)
					.where(and(eq(props.venueId, venue.id), inArray(props.id, [...ids.props])))
			: []
	]);
	return {
		entries,
		refs: {
			people: Object.fromEntries(people.map((p) => [p.id, p.name ?? p.email])),
			shows: Object.fromEntries(showRows.map((s) => [s.id, s.date])),
			scenes: Object.fromEntries(sceneRows.map((s) => [s.id, s.name])),
			props: Object.fromEntries(propRows.map((p) => [p.id, p.name]))
		}
	};
};
