import type { Handle } from '@sveltejs/kit';

export const THEME_COOKIE = 'gloaming-theme';

/** Read the theme cookie so the first paint is already in the right theme. */
export const themeHandle: Handle = ({ event, resolve }) => {
	event.locals.theme = event.cookies.get(THEME_COOKIE) === 'low-light' ? 'low-light' : 'dusk';
	return resolve(event, {
		transformPageChunk: ({ html }) => html.replace('%gloaming.theme%', event.locals.theme)
	});
};
