import type { LayoutServerLoad } from './$types';

// Public: only the theme and the signed-in person's whitelisted fields, no venue data.
export const load: LayoutServerLoad = ({ locals }) => ({
	theme: locals.theme,
	person: locals.person
});
