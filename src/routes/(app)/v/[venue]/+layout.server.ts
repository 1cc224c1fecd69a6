import { requireRole } from '$lib/server/auth/guard';
import type { LayoutServerLoad } from './$types';

export const load: LayoutServerLoad = (event) => {
	const venue = requireRole(event);
	return { venue };
};
