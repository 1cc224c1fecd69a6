// The app's side of working without signal: asks the service worker to keep the person's pages,
// and sends the results waiting on the phone on page load, when the connection returns, and on a
// timer. Pages read `phone` to say what is kept and what is waiting.

import { SAVED_CACHE } from './paths';
import { sendWaiting, type DrainReport } from './outbox';

export const phone = $state({
	/** Paths of pages kept on this phone for use without signal. */
	kept: [] as string[],
	online: true,
	/** The last sending stopped because the session ended. */
	signedOut: false
});

/** Ask the service worker to keep this page and the person's next 36 hours. */
export async function keepForOffline(personId: string, path: string) {
	if (typeof navigator === 'undefined' || !('serviceWorker' in navigator)) return;
	const reg = await navigator.serviceWorker.ready;
	const worker = reg.active;
	if (!worker) return;
	const channel = new MessageChannel();
	const reply = new Promise<{ kept?: string[] }>((resolve) => {
		channel.port1.onmessage = (e) => resolve(e.data ?? {});
	});
	worker.postMessage({ type: 'keep', personId, visiting: [path] }, [channel.port2]);
	const { kept } = await reply;
	if (Array.isArray(kept)) phone.kept = kept;
}

/** On sign-out: no copy of this person's pages stays on the phone. */
export function forgetOffline() {
	navigator.serviceWorker?.controller?.postMessage({ type: 'forget' });
	if (typeof caches !== 'undefined') void caches.delete(SAVED_CACHE);
	phone.kept = [];
}

let running: Promise<DrainReport> | null = null;

/** Send what waits now (once at a time in this tab). */
export async function sendNow(personId: string): Promise<DrainReport | null> {
	if (running) return running;
	running = sendWaiting(personId);
	try {
		const report = await running;
		phone.signedOut = report.stopped === 'signed-out';
		if (report.stopped === 'offline') phone.online = false;
		else if (report.stopped || report.sent || report.refused) phone.online = true;
		return report;
	} catch {
		// IndexedDB refused (private mode, storage full): nothing to send from here.
		return null;
	} finally {
		running = null;
	}
}

/** How often waiting results are tried again while the page is open. */
export const RETRY_MS = 20_000;

/** Keep sending for as long as the app is open; returns a function that stops. */
export function startSending(personId: string): () => void {
	phone.online = navigator.onLine;
	void sendNow(personId);
	const goOnline = () => {
		phone.online = true;
		void sendNow(personId);
	};
	const goOffline = () => (phone.online = false);
	window.addEventListener('online', goOnline);
	window.addEventListener('offline', goOffline);
	const timer = setInterval(() => void sendNow(personId), RETRY_MS);
	return () => {
		clearInterval(timer);
		window.removeEventListener('online', goOnline);
		window.removeEventListener('offline', goOffline);
	};
}
