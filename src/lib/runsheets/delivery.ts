import type { MailStatus } from '$lib/mail-words';
/** Where each person's newest run sheet for a show is, as the show page shows it. */
export interface Delivery {
	people: {
		personId: string;
		name: string;
		revision: number;
		reason: 'send' | 'auto' | 'change';
		messageId: string | null;
		status: MailStatus;
		attempts: number;
		lastError: string | null;
	}[];
	sent: number;
	failed: number;
	total: number;
}

/** The words for an action's result, in one place for the show page and the run-sheets page. */
export function resultWords(data: Record<string, unknown> | undefined): {
	ok: boolean;
	text: string;
} | null {
	if (!data) return null;
	if (typeof data.sendError === 'string') return { ok: false, text: data.sendError };
	if (typeof data.retried === 'string')
		return { ok: true, text: `Queued again for ${data.retried}.` };
	if (typeof data.queued === 'number') {
		const q = data.queued;
		const same = Number(data.unchanged ?? 0);
		if (q === 0)
			return { ok: true, text: 'Everyone already has the current run sheet; nothing new to send.' };
		return {
			ok: true,
			text: `Queued ${q} run sheet${q === 1 ? '' : 's'}${same ? ` (${same} unchanged, not sent again)` : ''}.`
		};
	}
	return null;
}
