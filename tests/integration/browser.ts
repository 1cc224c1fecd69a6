import { isActionFailure, isHttpError, isRedirect, type RequestEvent } from '@sveltejs/kit';

/**
 * A small stand-in for a browser talking to the app: a cookie jar, a client address and the app's
 * own hooks (Auth.js's routes under /auth, then the person hook), so sign-in, session and sign-out
 * behave as they do on the server. Route modules need `useTestEnv()` and the `$env` mock first
 * (see routes.ts), and AUTH_SECRET in process.env.
 */
export interface Reply {
	status: number;
	location?: string;
	text?: string;
	data?: Record<string, unknown>;
}

type Action = (event: RequestEvent) => unknown;

type Resolve = (event: RequestEvent) => Promise<Response>;

/** auth → person, as hooks.server.ts chains them (SvelteKit's sequence needs a live server). */
const hooks = async () => {
	const { handle } = await import('../../src/auth');
	const { personHandle } = await import('../../src/lib/server/hooks/person');
	return ({ event, resolve }: { event: RequestEvent; resolve: Resolve }) =>
		handle({
			event,
			resolve: (e) => personHandle({ event: e, resolve: resolve as never }) as Promise<Response>
		}) as Promise<Response>;
};

export class Browser {
	jar = new Map<string, string>();
	constructor(
		public address = '127.0.0.1',
		public extraHeaders: Record<string, string> = {}
	) {}

	private keep(name: string, value: string, opts: { maxAge?: number; expires?: Date } = {}) {
		const gone = value === '' || opts.maxAge === 0 || (opts.expires && opts.expires < new Date());
		if (gone) this.jar.delete(name);
		else this.jar.set(name, value);
	}

	private event(path: string, init: RequestInit): RequestEvent {
		const url = new URL(path, 'http://127.0.0.1');
		const headers = new Headers(init.headers);
		for (const [k, v] of Object.entries(this.extraHeaders)) headers.set(k, v);
		if (this.jar.size) headers.set('cookie', [...this.jar].map(([k, v]) => `${k}=${v}`).join('; '));
		const request = new Request(url, { ...init, headers });
		return {
			request,
			url,
			params: {},
			route: { id: null },
			locals: { person: null, venue: null, theme: 'dusk' },
			cookies: {
				get: (n: string) => this.jar.get(n),
				getAll: () => [...this.jar].map(([name, value]) => ({ name, value })),
				set: (n: string, v: string, o?: { maxAge?: number; expires?: Date }) => this.keep(n, v, o),
				delete: (n: string) => this.jar.delete(n),
				serialize: () => ''
			},
			fetch,
			getClientAddress: () => this.address,
			platform: undefined,
			setHeaders() {},
			isDataRequest: false,
			isSubRequest: false,
			isRemoteRequest: false,
			tracing: { enabled: false, root: null, current: null }
		} as unknown as RequestEvent;
	}

	private takeCookies(res: Response) {
		for (const line of res.headers.getSetCookie()) {
			const [pair, ...attrs] = line.split(';');
			const at = pair.indexOf('=');
			const opts: { maxAge?: number; expires?: Date } = {};
			for (const a of attrs) {
				const [k, v] = a.trim().split('=');
				if (k.toLowerCase() === 'max-age') opts.maxAge = Number(v);
				if (k.toLowerCase() === 'expires') opts.expires = new Date(v);
			}
			this.keep(pair.slice(0, at).trim(), pair.slice(at + 1).trim(), opts);
		}
	}

	/** A request through the hooks; a path outside /auth answers with the signed-in person. */
	async fetch(
		path: string,
		init: RequestInit = {}
	): Promise<Reply & { person?: unknown; setCookies: string[] }> {
		const event = this.event(path, init);
		const handle = await hooks();
		const set: string[] = [];
		const cookies = event.cookies;
		// Record what the hooks set on the page's own cookies too, not only on the response.
		event.cookies = {
			...cookies,
			set: (...args: Parameters<typeof cookies.set>) => {
				set.push(args[0]);
				cookies.set(...args);
			}
		};
		const res = await handle({
			event,
			resolve: async (e) => Response.json({ person: e.locals.person })
		});
		this.takeCookies(res);
		const setCookies = [...set, ...res.headers.getSetCookie().map((l) => l.split('=')[0])];
		const text = await res.text();
		const location = res.headers.get('location') ?? undefined;
		if (path.startsWith('/auth/')) return { status: res.status, location, text, setCookies };
		return { status: res.status, person: JSON.parse(text).person, setCookies };
	}

	/** POST a form to an Auth.js route as a script would, straight past the sign-in page. */
	postAuth(path: string, form: Record<string, string>) {
		return this.fetch(path, {
			method: 'POST',
			headers: { 'content-type': 'application/x-www-form-urlencoded' },
			body: new URLSearchParams(form)
		});
	}

	/** Who the app thinks this browser is, or null. */
	async person() {
		return (await this.fetch('/')).person as { id: string; email: string } | null;
	}

	/** Submit a form action the way the page would, after the hooks ran. */
	async action(action: Action, path: string, form: Record<string, string>): Promise<Reply> {
		const body = new FormData();
		for (const [k, v] of Object.entries(form)) body.set(k, v);
		const event = this.event(path, { method: 'POST', body });
		const handle = await hooks();
		let reply: Reply | null = null;
		await handle({
			event,
			resolve: async (e) => {
				try {
					const out: unknown = await action(e);
					reply = isActionFailure(out)
						? { status: out.status, data: out.data as unknown as Record<string, unknown> }
						: { status: 200, data: (out ?? undefined) as Record<string, unknown> | undefined };
				} catch (err) {
					if (isRedirect(err)) reply = { status: err.status, location: err.location };
					else if (isHttpError(err)) reply = { status: err.status, text: err.body.message };
					else throw err;
				}
				return new Response();
			}
		});
		return reply!;
	}
}
