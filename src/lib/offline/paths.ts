// Which addresses a crew phone keeps for use without signal. Shared by the service worker, the
// pages that ask it to keep copies, and the server that lists a person's nights.

/** The cache of the signed-in person's own pages and data; emptied on sign-out. */
export const SAVED_CACHE = 'gloaming-saved';
/** Where the saved cache notes whose copies it holds. */
export const OWNER_KEY = '/__gloaming/owner';
/** The header a copy served from the phone carries: when it was saved (ISO 8601). */
export const SAVED_AT_HEADER = 'x-gloaming-saved-at';
/** How far ahead a phone keeps the checklists of the nights its person is called for. */
export const KEEP_AHEAD_MS = 36 * 3_600_000;
/** Copies older than this are dropped, whatever they are. */
export const KEEP_FOR_MS = 48 * 3_600_000;

const SLUG = '[a-z0-9][a-z0-9-]*';
const UUID = '[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}';
const KEPT_PAGES = [
	new RegExp(`^/venues$`),
	new RegExp(`^/v/${SLUG}$`),
	new RegExp(`^/v/${SLUG}/my-nights$`),
	new RegExp(`^/v/${SLUG}/shows/${UUID}/checklist$`)
];
const KEPT_DATA = new RegExp(`^/api/v/${SLUG}/shows/${UUID}/checks$`);

/** A page whose copy the phone keeps: the venue list, Tonight, My nights and a show's checklist. */
export function isKeptPage(pathname: string): boolean {
	return KEPT_PAGES.some((re) => re.test(pathname));
}

/** A JSON address whose answer the phone keeps: a show's checks. */
export function isKeptData(pathname: string): boolean {
	return KEPT_DATA.test(pathname);
}

/** The address SvelteKit loads a page's data from during in-app navigation. */
export function dataPathOf(pathname: string): string {
	return `${pathname.replace(/\/$/, '')}/__data.json`;
}

/** The page a data address belongs to, or null when it is not one. */
export function pageOfData(pathname: string): string | null {
	return pathname.endsWith('/__data.json')
		? pathname.slice(0, -'/__data.json'.length) || '/'
		: null;
}

/** What the server lists for a person: pages and data to keep, and until when they matter. */
export interface KeepList {
	personId: string;
	pages: string[];
	data: string[];
}
