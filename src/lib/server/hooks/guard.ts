import { error, redirect, type Handle } from '@sveltejs/kit';
import type { Role } from '$lib/roles';

/** Route-id prefixes and the roles allowed there. Handlers check again with requireRole. */
export const ROUTE_ROLES: { prefix: string; roles: Role[] }[] = [
	{ prefix: '/(app)/v/[venue]/members', roles: ['owner'] },
	{ prefix: '/(app)/v/[venue]/settings', roles: ['owner'] },
	{ prefix: '/(app)/v/[venue]/activity', roles: ['owner'] },
	{ prefix: '/(app)/v/[venue]/mail/preview', roles: ['owner'] },
	{ prefix: '/(app)/v/[venue]/mail', roles: ['owner', 'show_manager'] },
	{ prefix: '/(app)/v/[venue]/safety', roles: ['owner', 'show_manager'] }
];

export function rolesForRoute(routeId: string): Role[] | null {
	return ROUTE_ROLES.find((r) => routeId.startsWith(r.prefix))?.roles ?? null;
}

/**
 * The coarse guard: signed-in areas need a person, venue routes need a membership, and some
 * paths need a role. Page views fall through to the load functions so people see a proper
 * 403/404 page inside the app; anything else (actions, API calls) is stopped here.
 */
export const guardHandle: Handle = ({ event, resolve }) => {
	const id = event.route.id;
	if (!id) return resolve(event);
	const isApi = id.startsWith('/api/');
	// Boards carry a key instead of a session; their route checks it.
	const isBoard = id.startsWith('/api/boards/');
	const needsPerson = (id.startsWith('/(app)') || isApi) && !isBoard;
	const isPageView = !isApi && (event.request.method === 'GET' || event.request.method === 'HEAD');
	if (needsPerson && !event.locals.person) {
		if (isApi) error(401, 'Sign in to use this.');
		if (isPageView) {
			redirect(
				303,
				`/sign-in?redirectTo=${encodeURIComponent(event.url.pathname + event.url.search)}`
			);
		}
		error(401, 'Your session has ended. Sign in again.');
	}
	if (event.params.venue !== undefined && !isPageView) {
		const venue = event.locals.venue;
		if (!venue) error(404, 'There is no such venue, or you are not a member of it.');
		const roles = rolesForRoute(id);
		if (roles && !roles.includes(venue.role)) error(403, 'Your role in this venue cannot do that.');
	}
	return resolve(event);
};
