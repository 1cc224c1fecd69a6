// Browser helpers for the checklist pages: ids made on the phone, results an earlier version kept
// while offline, and the live stream of a show's changes.

/** A v4 UUID, also where crypto.randomUUID is missing (plain-http addresses on a LAN). */
export function newClientId(): string {
	if (typeof crypto.randomUUID === 'function') return crypto.randomUUID();
	const b = crypto.getRandomValues(new Uint8Array(16));
	b[6] = (b[6] & 0x0f) | 0x40;
	b[8] = (b[8] & 0x3f) | 0x80;
	const h = [...b].map((x) => x.toString(16).padStart(2, '0')).join('');
	return `${h.slice(0, 8)}-${h.slice(8, 12)}-${h.slice(12, 16)}-${h.slice(16, 20)}-${h.slice(20)}`;
}

/** A result an earlier version of the app kept in localStorage while offline. */
export interface EarlierPending {
	clientId: string;
	checkId: string;
	outcome?: 'pass' | 'fail';
	idleReading?: number | null;
	presentReading?: number | null;
	note?: string | null;
	expect: 'pass' | 'fail';
	at: string;
}

const storeKey = (showId: string) => `gloaming:pending-results:${showId}`;

/**
 * Take the results an earlier version of the app left waiting in localStorage for a show, so they
 * can move to the outbox; they are removed from localStorage only by `dropEarlierPending`.
 */
export function earlierPending(showId: string): EarlierPending[] {
	try {
		const raw = localStorage.getItem(storeKey(showId));
		const list = raw ? (JSON.parse(raw) as EarlierPending[]) : [];
		return Array.isArray(list) ? list : [];
	} catch {
		return [];
	}
}

export function dropEarlierPending(showId: string) {
	try {
		localStorage.removeItem(storeKey(showId));
	} catch {
		// Nothing to drop.
	}
}

/** Call onChange after every change to a show's checklist; returns a function that stops. */
export function watchShow(url: string, onChange: () => void): () => void {
	if (typeof EventSource === 'undefined') return () => {};
	const source = new EventSource(url);
	source.addEventListener('changed', onChange);
	// After a dropped connection EventSource reconnects by itself; catch up on what was missed.
	source.addEventListener('open', onChange);
	return () => source.close();
}
