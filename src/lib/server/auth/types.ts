import type { Role } from '$lib/roles';

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
	role: Role;
}
