import { redirect } from '@sveltejs/kit';
import { signOut } from '../../../auth';
import type { Actions, PageServerLoad } from './$types';

// Public: nothing to show; sign-out happens by POST.
export const load: PageServerLoad = () => redirect(303, '/');

export const actions: Actions = {
	// Public: ending one's own session.
	default: (event) => signOut(event)
};
