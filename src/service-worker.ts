/// <reference types="@sveltejs/kit" />
/// <reference no-default-lib="true"/>
/// <reference lib="esnext" />
/// <reference lib="webworker" />

// Keeps Gloaming usable on a crew phone without signal. The app's own files (scripts, styles,
// fonts, icons) are kept per version. The signed-in person's Tonight and My nights pages, and the
// checklist (page, page data, checks) of every night they are called for in the next 36 hours,
// are kept in a cache of their own, emptied on sign-out and whenever someone else signs in.
// Pages and data always come from the network first; a kept copy is used only when the network
// fails, and says when it was saved.

import { build, files, version } from '$service-worker';
import {
	KEEP_FOR_MS,
	OWNER_KEY,
	SAVED_AT_HEADER,
	SAVED_CACHE,
	dataPathOf,
	isKeptData,
	isKeptPage,
	pageOfData,
	type KeepList
} from '$lib/offline/paths';

const sw = self as unknown as ServiceWorkerGlobalScope;
const SHELL_CACHE = `gloaming-shell-${version}`;
const SHELL = new Set([...build, ...files]);
const OFFLINE_PAGE = '/offline.html';
/** A slow network counts as none after this long, when a kept copy is there to show. */
const PATIENCE_MS = 8000;
/** A page saved this recently is not fetched again just to keep it. */
const FRESH_MS = 60_000;

sw.addEventListener('install', (event) => {
	event.waitUntil(
		(async () => {
			const cache = await caches.open(SHELL_CACHE);
			await cache.addAll([...SHELL]);
			await sw.skipWaiting();
		})()
	);
});

sw.addEventListener('activate', (event) => {
	event.waitUntil(
		(async () => {
			for (const key of await caches.keys()) {
				if (key.startsWith('gloaming-shell-') && key !== SHELL_CACHE) await caches.delete(key);
			}
			await sw.clients.claim();
		})()
	);
});

const here = (path: string) => new URL(path, sw.location.origin).href;

/** A copy of a response, marked with when it was saved. */
async function marked(res: Response): Promise<Response> {
	const headers = new Headers(res.headers);
	headers.set(SAVED_AT_HEADER, new Date().toISOString());
	return new Response(await res.blob(), {
		status: res.status,
		statusText: res.statusText,
		headers
	});
}

/** Raised by every sign-out, so a copy fetched before it is never put back after it. */
let generation = 0;

async function keepCopy(path: string, res: Response, since: number) {
	if (!res.ok || res.type !== 'basic' || res.redirected) return;
	const copy = await marked(res);
	if (since !== generation) return;
	const cache = await caches.open(SAVED_CACHE);
	await cache.put(here(path), copy);
}

/** The kept copy, if any; looking never makes the cache (after sign-out there is none). */
async function savedCopy(path: string): Promise<Response | undefined> {
	if (!(await caches.has(SAVED_CACHE))) return undefined;
	return caches.match(here(path), { cacheName: SAVED_CACHE });
}

async function savedAt(path: string): Promise<number | null> {
	const copy = await savedCopy(path);
	const at = copy?.headers.get(SAVED_AT_HEADER);
	return at ? Date.parse(at) : null;
}

/** Empty the person's cache: on sign-out, and before keeping someone else's pages. */
async function forget() {
	generation++;
	await caches.delete(SAVED_CACHE);
}

async function ownerOf(): Promise<string | null> {
	const copy = await savedCopy(OWNER_KEY);
	return copy ? copy.text() : null;
}

async function adopt(personId: string) {
	if ((await ownerOf()) === personId) return;
	await forget();
	const cache = await caches.open(SAVED_CACHE);
	await cache.put(here(OWNER_KEY), new Response(personId));
}

/**
 * Fetch and keep a page, and its data for in-app navigation (fetched whole, so it stands in for
 * any partial load). A page that answers with anything but itself (a sign-in redirect, an error)
 * is not kept.
 */
async function keepPage(path: string, since: number) {
	const fresh = async (p: string) => {
		const at = await savedAt(p);
		return at !== null && Date.now() - at < FRESH_MS;
	};
	try {
		if (!(await fresh(path))) {
			const page = await fetch(here(path), { credentials: 'same-origin', redirect: 'manual' });
			if (!page.ok) return false;
			await keepCopy(path, page, since);
		}
		const dataPath = dataPathOf(path);
		if (!(await fresh(dataPath))) {
			const data = await fetch(here(dataPath), { credentials: 'same-origin' });
			const text = data.ok ? await data.clone().text() : '';
			// A data answer that redirects (to sign-in) or fails is not a copy of the page.
			if (data.ok && !/^\{"type":"(redirect|error)"/.test(text))
				await keepCopy(dataPath, data, since);
		}
		return true;
	} catch {
		return (await savedCopy(path)) !== undefined;
	}
}

async function keepData(path: string, since: number) {
	try {
		await keepCopy(path, await fetch(here(path), { credentials: 'same-origin' }), since);
	} catch {
		// No connection: the copy already kept stays.
	}
}

/** Drop copies saved too long ago (last week's checklists) and those of nights no longer listed. */
async function prune(listed: Set<string>) {
	const cache = await caches.open(SAVED_CACHE);
	for (const req of await cache.keys()) {
		const path = new URL(req.url).pathname;
		if (path === OWNER_KEY) continue;
		const res = await cache.match(req);
		const at = Date.parse(res?.headers.get(SAVED_AT_HEADER) ?? '');
		const old = !Number.isFinite(at) || Date.now() - at > KEEP_FOR_MS;
		if (old && !listed.has(path)) await cache.delete(req);
	}
}

let lastList = 0;

/**
 * Keep the pages the person is on and every page of their next 36 hours. Answers with the paths
 * now kept on the phone.
 */
async function keep(personId: string, visiting: string[]): Promise<string[]> {
	await adopt(personId);
	const since = generation;
	const kept = new Set<string>();
	for (const path of visiting.filter(isKeptPage)) if (await keepPage(path, since)) kept.add(path);
	let list: KeepList | null = null;
	if (Date.now() - lastList > FRESH_MS || visiting.length === 0) {
		try {
			const res = await fetch(here('/api/offline'), { credentials: 'same-origin' });
			if (res.ok) list = (await res.json()) as KeepList;
		} catch {
			// No connection: what is kept stays kept.
		}
	}
	if (list && list.personId === personId) {
		lastList = Date.now();
		for (const path of list.pages)
			if (isKeptPage(path) && (await keepPage(path, since))) kept.add(path);
		for (const path of list.data) if (isKeptData(path)) await keepData(path, since);
		await prune(new Set([...list.pages, ...list.pages.map(dataPathOf), ...list.data]));
	}
	const cache = await caches.open(SAVED_CACHE);
	for (const req of await cache.keys()) {
		const path = new URL(req.url).pathname;
		if (isKeptPage(path)) kept.add(path);
	}
	return [...kept];
}

sw.addEventListener('message', (event) => {
	const msg = event.data as { type?: string; personId?: unknown; visiting?: unknown } | null;
	const port = event.ports[0];
	if (msg?.type === 'keep' && typeof msg.personId === 'string') {
		const visiting = Array.isArray(msg.visiting)
			? msg.visiting.filter((p): p is string => typeof p === 'string')
			: [];
		event.waitUntil(
			keep(msg.personId, visiting).then(
				(kept) => port?.postMessage({ kept }),
				() => port?.postMessage({ kept: [] })
			)
		);
	} else if (msg?.type === 'forget') {
		event.waitUntil(forget().then(() => port?.postMessage({ kept: [] })));
	}
});

/** Network within the patience allowed, else the kept copy; the network answer still refreshes it. */
async function networkFirst(
	event: FetchEvent,
	path: string,
	keepAnswer: boolean,
	fallback: () => Promise<Response | undefined>
): Promise<Response> {
	const since = generation;
	const network = fetch(event.request);
	if (keepAnswer)
		event.waitUntil(
			network
				.then((res) => keepCopy(path, res.clone(), since))
				.catch(() => {
					// Nothing new to keep.
				})
		);
	const copy = await savedCopy(path);
	try {
		if (!copy) return await network;
		let timer: ReturnType<typeof setTimeout> | undefined;
		const slow = new Promise<'slow'>((r) => (timer = setTimeout(() => r('slow'), PATIENCE_MS)));
		const first = await Promise.race([network, slow]);
		clearTimeout(timer);
		return first === 'slow' ? copy : first;
	} catch {
		return (await fallback()) ?? Response.error();
	}
}

sw.addEventListener('fetch', (event) => {
	const req = event.request;
	const url = new URL(req.url);
	if (url.origin !== sw.location.origin) return;

	// Signing out: nobody after this person sees their pages.
	if (req.method === 'POST' && url.pathname === '/sign-out') {
		event.respondWith(forget().then(() => fetch(req)));
		return;
	}
	if (req.method !== 'GET') return;

	if (SHELL.has(url.pathname)) {
		event.respondWith(
			(async () => (await caches.match(req, { cacheName: SHELL_CACHE })) ?? fetch(req))()
		);
		return;
	}

	if (req.mode === 'navigate') {
		const kept = isKeptPage(url.pathname);
		event.respondWith(
			networkFirst(event, url.pathname, kept, async () =>
				kept
					? ((await savedCopy(url.pathname)) ?? caches.match(OFFLINE_PAGE))
					: caches.match(OFFLINE_PAGE)
			)
		);
		return;
	}

	// In-app navigation loads a page's data; the kept whole copy stands in when offline. The app's
	// loads are partial (x-sveltekit-invalidated), so they are not kept: the worker's own are.
	const page = pageOfData(url.pathname);
	if (page !== null && isKeptPage(page)) {
		event.respondWith(networkFirst(event, url.pathname, false, () => savedCopy(url.pathname)));
		return;
	}
	if (isKeptData(url.pathname)) {
		event.respondWith(networkFirst(event, url.pathname, true, () => savedCopy(url.pathname)));
	}
});
