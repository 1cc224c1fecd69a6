import type { SessionPerson, VenueContext } from '$lib/server/auth/types';

declare global {
	namespace App {
		interface Locals {
			/** The signed-in person, resolved once per request in hooks; null when signed out. */
			person: SessionPerson | null;
			/** Set by the venue hook for routes under /v/[venue]; the person's membership in it. */
			venue: VenueContext | null;
			/** The session hook already read the venue with the session (one query for both). */
			venueResolved?: boolean;
			/** Theme chosen by the person, read from a cookie so the server renders it. */
			theme: 'dusk' | 'low-light';
		}
		interface Error {
			message: string;
			code?: string;
		}
		interface PageData {
			person?: { id: string; name: string | null; email: string } | null;
		}
	}
}

export {};
