import { demoMails } from '$emails/demo';
import { requireRole } from '$lib/server/auth/guard';
import { config } from '$lib/server/config';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const venue = requireRole(event, 'owner');
	return { templates: demoMails(venue.name, config.origin) };
};
