import { inject } from 'vitest';
import { isHttpError, isRedirect, type RequestEvent } from '@sveltejs/kit';
import type { SessionPerson } from '../../src/lib/server/auth/types';

/**
 * Calls SvelteKit route handlers and form actions the way the server does: a real Request, the
 * route's params, and locals filled by the app's own venue hook from the test database. Thrown
 * `error()`s and redirects come back as statuses, as the server would send them.
 *
 * Route modules import the app's database client, which reads DATABASE_URL when first imported:
 * `useTestEnv()` must run before `await import()` of a route, and the test file must
 * `vi.mock('$env/dynamic/private', () => ({ env: process.env }))`.
 */
export function useTestEnv() {
	process.env.DATABASE_URL = inject('databaseUrl');
	process.env.S3_ENDPOINT = inject('s3Endpoint');
	process.env.S3_BUCKET = 'gloaming-it';
	process.env.S3_ACCESS_KEY_ID = 'S3RVER';
	process.env.S3_SECRET_ACCESS_KEY = 'S3RVER';
}

export interface Call {
	path: string;
	params: Record<string, string>;
	person: SessionPerson | null;
	method?: string;
	body?: BodyInit | null;
	json?: unknown;
	headers?: Record<string, string>;
	/** The SvelteKit route id, e.g. /(app)/v/[venue]/rooms, for hooks that read it. */
	routeId?: string;
}

export interface Answer {
	status: number;
	body: Record<string, unknown> | null;
	location?: string;
}

type Handler = (event: RequestEvent) => unknown;

/** The event the server would build for a call, with locals filled by the venue hook. */
export async function eventFor(call: Call): Promise<RequestEvent> {
	const url = new URL(call.path, 'http://127.0.0.1');
	const headers = new Headers(call.headers);
	let body = call.body ?? null;
	if (call.json !== undefined) {
		body = JSON.stringify(call.json);
		headers.set('content-type', 'application/json');
	}
	const request = new Request(url, {
		method: call.method ?? (body ? 'POST' : 'GET'),
		body,
		headers,
		// A streamed body (an upload) needs this in Node's fetch.
		...(body instanceof ReadableStream ? { duplex: 'half' } : {})
	} as RequestInit);
	const event = {
		request,
		url,
		params: call.params,
		route: { id: call.routeId ?? null },
		locals: { person: call.person, venue: null, theme: 'dusk' },
		cookies: { get: () => undefined, getAll: () => [], set() {}, delete() {}, serialize: () => '' },
		fetch,
		getClientAddress: () => '127.0.0.1',
		platform: undefined,
		setHeaders() {},
		isDataRequest: false,
		isSubRequest: false,
		isRemoteRequest: false,
		tracing: { enabled: false, root: null, current: null }
	} as unknown as RequestEvent;
	const { venueHandle } = await import('../../src/lib/server/hooks/venue');
	await venueHandle({ event, resolve: async () => new Response() } as never);
	return event;
}

/** What a handler, load or action answered, with thrown errors and redirects as statuses. */
export async function answerOf(run: () => unknown): Promise<Answer> {
	try {
		const out = await run();
		if (out instanceof Response) {
			// An event stream never ends: its status is the answer.
			if (out.headers.get('content-type')?.startsWith('text/event-stream')) {
				await out.body?.cancel();
				return { status: out.status, body: null };
			}
			const text = await out.text();
			let body: Record<string, unknown> | null = null;
			try {
				body = text ? JSON.parse(text) : null;
			} catch {
				body = { text };
			}
			return { status: out.status, body };
		}
		// A form action's result: fail() gives { status, data }, success gives plain data.
		if (out && typeof out === 'object' && 'status' in out && 'data' in out)
			return { status: (out as { status: number }).status, body: (out as { data: never }).data };
		return { status: 200, body: (out ?? null) as Record<string, unknown> | null };
	} catch (e) {
		if (isHttpError(e))
			return { status: e.status, body: e.body as unknown as Record<string, unknown> };
		if (isRedirect(e)) return { status: e.status, body: null, location: e.location };
		throw e;
	}
}

/** Run a +server.ts handler. */
export async function callHandler(handler: Handler, call: Call): Promise<Answer> {
	const event = await eventFor(call);
	return answerOf(() => handler(event));
}

/** Run a form action with form fields. */
export async function callAction(
	action: Handler,
	call: Omit<Call, 'body' | 'json'> & { form: Record<string, string> }
): Promise<Answer> {
	const form = new FormData();
	for (const [k, v] of Object.entries(call.form)) form.set(k, v);
	const event = await eventFor({ ...call, method: 'POST', body: form });
	return answerOf(() => action(event));
}

export const asSession = (p: {
	id: string;
	name: string | null;
	email: string;
}): SessionPerson => ({
	id: p.id,
	name: p.name,
	email: p.email
});
