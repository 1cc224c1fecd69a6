import type { Role } from '$lib/roles';
import type { Clock } from '$lib/util/when';

export interface SessionPerson {
	id: string;
	name: string | null;
	email: string;
}

export interface VenueContext {
	id: string;
	slug: string;
	name: string;
	kind: 'haunt' | 'trail' | 'exhibit';
	timeZone: string;
	/** How the venue writes times: '19:30' or '7:30 pm'. */
	clock: Clock;
	role: Role;
}
