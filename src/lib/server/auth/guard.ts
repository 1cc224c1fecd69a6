import { error, redirect, type RequestEvent } from '@sveltejs/kit';
import { ROLE_LABELS, type Role } from '$lib/roles';
import type { SessionPerson, VenueContext } from './types';

type GuardEvent = Pick<RequestEvent, 'locals' | 'url'> & {
	params?: Partial<Record<string, string>>;
};

function signInRedirect(event: GuardEvent): never {
	const back = event.url.pathname + event.url.search;
	redirect(303, `/sign-in?redirectTo=${encodeURIComponent(back)}`);
}

/** The signed-in person, or a redirect to sign-in (pages) / 401 (API). */
export function requirePerson(event: GuardEvent): SessionPerson {
	if (!event.locals.person) {
		if (event.url.pathname.startsWith('/api/')) error(401, 'Sign in to use this.');
		signInRedirect(event);
	}
	return event.locals.person;
}

/**
 * The venue of this route and the person's role in it. A person who is not a member gets 404,
 * the same as a venue that does not exist, so venue names do not leak. With roles given, any
 * other role gets 403.
 */
export function requireRole(event: GuardEvent, ...roles: Role[]): VenueContext {
	requirePerson(event);
	// Reading params.venue also tells SvelteKit to rerun the load when the venue in the URL changes.
	const slug = event.params?.venue;
	const venue = event.locals.venue;
	if (!venue || (slug !== undefined && slug !== venue.slug))
		error(404, 'There is no such venue, or you are not a member of it.');
	if (roles.length && !roles.includes(venue.role)) {
		const allowed = roles.map((r) => ROLE_LABELS[r]).join(', ');
		error(
			403,
			`This needs one of these roles: ${allowed}. Your role here is ${ROLE_LABELS[venue.role]}.`
		);
	}
	return venue;
}

/** Roles that may change a venue's props, scenes and rooms. */
export const EDITORS: Role[] = ['owner', 'designer'];
/** Roles that plan the schedule. */
export const PLANNERS: Role[] = ['owner', 'show_manager'];
