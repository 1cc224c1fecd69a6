/**
 * The crew checklist's state on the phone: the checks on screen, what is being typed per check,
 * the board's readings, and this person's results waiting in the outbox. The page makes one and
 * passes it to each check card.
 */
import { evaluateSensorTest } from '$lib/checklists/evaluate';
import { dropEarlierPending, earlierPending, newClientId, watchShow } from '$lib/checklists/client';
import { hazardsOf, stateOf, type CheckView, type ChecklistView } from '$lib/checklists/view';
import {
	keepResult,
	letGo,
	outboxOf,
	tryAgain,
	watchOutbox,
	type OutboxItem
} from '$lib/offline/outbox';
import { SAVED_AT_HEADER } from '$lib/offline/paths';
import { phone, sendNow } from '$lib/offline/phone.svelte';
import type { PageData } from './$types';

/** What the boards say: per live sensor test, its idle reading now (server times, ms). */
type Idle = { reading: number; at: number; count: number };
/** Readings taken from the board, as filled in: kept only while the fields still say them. */
type Taken = {
	idle: number;
	idleText: string;
	present: number | null;
	presentText: string | null;
	presentAt: number | null;
};

/** Six significant figures: what the field shows of a board's reading. */
const asText = (v: number) => String(Number(v.toPrecision(6)));
/** A time as the result records it: now, or a board reading's server time (ms). */
const isoOf = (ms?: number) => new Date(ms ?? Date.now()).toISOString();
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

export class ChecklistState {
	#data: () => PageData;
	view: ChecklistView = $derived.by(() => this.#data().checklist);
	/** Every check is here (a long list arrives with its first rooms and fills in from the API). */
	full = $derived.by(() => !this.#data().partial);
	/** This person's results for this night kept on the phone: waiting, refused, and lately sent. */
	outbox = $state.raw<OutboxItem[]>([]);
	/** When the copy on screen was saved on the phone, when it came from there and not the server. */
	savedAt = $state<string | null>(null);
	storageRefused = $state(false);
	/** Per check: readings and notes being typed, and messages. */
	idle = $state<Record<string, string>>({});
	present = $state<Record<string, string>>({});
	notes = $state<Record<string, string>>({});
	photos = $state<Record<string, File | null>>({});
	photoInputs = $state<Record<string, HTMLInputElement | undefined>>({});
	messages = $state<Record<string, string>>({});
	boardIdle = $state<Record<string, Idle>>({});
	taken = $state<Record<string, Taken>>({});
	/** Per check being read: the seconds left in its window. */
	counting = $state<Record<string, number>>({});
	windowSeconds = $state(5);

	signed = $derived(this.view.signOff !== null);
	waiting = $derived(this.outbox.filter((i) => i.state === 'waiting'));
	refused = $derived(this.outbox.filter((i) => i.state === 'refused'));
	sent = $derived(this.outbox.filter((i) => i.state === 'sent').reverse());
	pendingFor = $derived(
		// eslint-disable-next-line svelte/prefer-svelte-reactivity -- made again whole on each change, never changed in place
		new Map(this.outbox.filter((i) => i.state !== 'sent').map((i) => [i.checkId, i]))
	);
	counts = $derived.by(() => {
		if (!this.full) return this.#data().counts;
		const n = { pass: 0, fail: 0, open: 0, stood_down: 0 };
		for (const c of this.view.checks) n[stateOf(c)]++;
		return n;
	});
	hazards = $derived.by(() => (this.full ? hazardsOf(this.view.checks) : this.#data().hazards));

	constructor(data: () => PageData) {
		this.#data = data;
	}

	get #api() {
		const d = this.#data();
		return `/api/v/${d.venue.slug}/shows/${d.show.id}`;
	}
	get #personId() {
		return this.#data().person!.id;
	}

	/** A check's readings so far, judged as the server will judge them; null until both are typed. */
	preview(check: CheckView) {
		if (check.expected.mode !== 'reading') return null;
		const i = this.idle[check.id]?.trim();
		const p = this.present[check.id]?.trim();
		if (!i || !p) return null;
		return evaluateSensorTest(check.expected.band, Number(i), Number(p));
	}

	/** Both readings are still the board's, as it filled them in. */
	fromBoard(id: string) {
		const t = this.taken[id];
		return (
			!!t?.presentText &&
			t.presentText === this.present[id]?.trim() &&
			t.idleText === this.idle[id]?.trim()
		);
	}

	async pollBoards() {
		if (
			!phone.online ||
			this.signed ||
			!this.view.checks.some((c) => c.expected.mode === 'reading')
		) {
			this.boardIdle = {};
			return;
		}
		try {
			const res = await fetch(`${this.#api}/board`, { headers: { accept: 'application/json' } });
			if (!res.ok) throw new Error(String(res.status));
			const body = (await res.json()) as {
				now: number;
				idles: Record<string, Idle>;
				presentSeconds: number;
			};
			this.boardIdle = body.idles;
			this.windowSeconds = body.presentSeconds;
		} catch {
			// No signal or no answer: no board readings, typing as ever.
			this.boardIdle = {};
		}
	}

	/** The button: idle from the seconds before the press, then the peak of the window after it. */
	async takePresent(check: CheckView) {
		const api = this.#api;
		this.messages[check.id] = '';
		try {
			const res = await fetch(`${api}/board?check=${check.id}`);
			if (!res.ok) throw new Error('refused');
			const start = (await res.json()) as { now: number; idles: Record<string, Idle> };
			const before = start.idles[check.id];
			if (!before) {
				this.messages[check.id] = 'The board has gone quiet: type the readings instead.';
				return;
			}
			this.idle[check.id] = asText(before.reading);
			this.taken[check.id] = {
				idle: before.reading,
				idleText: this.idle[check.id],
				present: null,
				presentText: null,
				presentAt: null
			};
			const endsAt = Date.now() + this.windowSeconds * 1000;
			this.counting[check.id] = this.windowSeconds;
			while (Date.now() < endsAt) {
				await sleep(200);
				this.counting[check.id] = Math.max(0, Math.ceil((endsAt - Date.now()) / 1000));
			}
			let peak: { reading: number; at: number } | null = null;
			for (let i = 0; i < 6; i++) {
				const r = await fetch(`${api}/board?check=${check.id}&from=${start.now}`);
				if (!r.ok) throw new Error('refused');
				const b = (await r.json()) as {
					peak: { reading: number; at: number } | null;
					complete: boolean;
				};
				peak = b.peak;
				if (b.complete) break;
				await sleep(400);
			}
			if (!peak) {
				this.messages[check.id] =
					'The board sent nothing in those seconds: press again, or type the present reading.';
				return;
			}
			this.present[check.id] = asText(peak.reading);
			this.taken[check.id] = {
				...this.taken[check.id],
				present: peak.reading,
				presentText: this.present[check.id],
				presentAt: peak.at
			};
		} catch {
			this.messages[check.id] = 'The board could not be read just now: type the readings instead.';
		} finally {
			delete this.counting[check.id];
		}
	}

	async refresh() {
		try {
			const res = await fetch(`${this.#api}/checks`);
			if (!res.ok) return;
			this.view = (await res.json()) as ChecklistView;
			this.full = true;
			this.savedAt = res.headers.get(SAVED_AT_HEADER);
		} catch {
			// No signal and no copy: the page keeps what it has.
		}
	}

	async readOutbox() {
		try {
			const before = this.outbox.filter((i) => i.state === 'sent').length;
			const showId = this.#data().show.id;
			this.outbox = (await outboxOf(this.#personId)).filter((i) => i.showId === showId);
			this.storageRefused = false;
			if (this.outbox.filter((i) => i.state === 'sent').length > before) await this.refresh();
		} catch {
			this.storageRefused = true;
		}
	}

	async record(check: CheckView, outcome?: 'pass' | 'fail') {
		const { idle, present, messages } = this;
		messages[check.id] = '';
		let reading: {
			idleReading?: number;
			presentReading?: number;
			expect: 'pass' | 'fail';
			fromBoard?: boolean;
			boardReadAt?: string | null;
		};
		if (check.expected.mode === 'reading') {
			const i = Number((idle[check.id] ?? '').replace(',', '.'));
			const p = Number((present[check.id] ?? '').replace(',', '.'));
			if (!idle[check.id]?.trim() || !Number.isFinite(i)) {
				messages[check.id] = 'Type the idle reading as a number, like 1480.';
				return;
			}
			if (!present[check.id]?.trim() || !Number.isFinite(p)) {
				messages[check.id] = 'Type the present reading as a number, like 1550.';
				return;
			}
			// Readings as the board gave them, unless the crew member typed over them.
			const t = this.taken[check.id];
			const fromBoard =
				!!t &&
				t.present !== null &&
				t.idleText === idle[check.id]?.trim() &&
				t.presentText === present[check.id]?.trim();
			const iv = fromBoard ? t.idle : i;
			const pv = fromBoard ? t.present! : p;
			const verdict = evaluateSensorTest(check.expected.band, iv, pv);
			reading = {
				idleReading: iv,
				presentReading: pv,
				expect: verdict.outcome,
				fromBoard,
				boardReadAt: fromBoard ? isoOf(t.presentAt!) : null
			};
		} else {
			reading = { expect: outcome! };
		}
		const file = this.photos[check.id];
		const data = this.#data();
		try {
			await keepResult({
				clientId: newClientId(),
				personId: this.#personId,
				venueSlug: data.venue.slug,
				showId: data.show.id,
				checkId: check.id,
				label: check.label,
				outcome,
				...reading,
				note: this.notes[check.id]?.trim() || null,
				photo: file
					? { clientId: newClientId(), blob: file, name: file.name, photoId: null }
					: null,
				recordedAt: isoOf()
			});
		} catch {
			messages[check.id] =
				'This phone would not store the result (its storage is full or switched off), so it cannot wait for signal. Free some space, or record it when you have signal.';
			return;
		}
		idle[check.id] = '';
		present[check.id] = '';
		delete this.taken[check.id];
		this.notes[check.id] = '';
		this.photos[check.id] = null;
		if (this.photoInputs[check.id]) this.photoInputs[check.id]!.value = '';
		await this.readOutbox();
		await sendNow(this.#personId);
	}

	async again(item: OutboxItem, withoutPhoto = false) {
		await tryAgain(item, withoutPhoto);
		await sendNow(this.#personId);
	}

	async remove(item: OutboxItem) {
		if (
			!confirm(
				`Remove the refused result for "${item.label}" from this phone? It will not be sent.`
			)
		)
			return;
		await letGo(item);
	}

	/** Results an earlier version of the app left in localStorage move to the outbox, in order. */
	async moveEarlier() {
		const data = this.#data();
		const earlier = earlierPending(data.show.id);
		if (!earlier.length) return;
		try {
			// eslint-disable-next-line svelte/prefer-svelte-reactivity -- a throwaway lookup, not state
			const have = new Set((await outboxOf(this.#personId)).map((i) => i.clientId));
			for (const e of earlier) {
				if (have.has(e.clientId)) continue;
				const label = this.view.checks.find((c) => c.id === e.checkId)?.label ?? 'A check';
				await keepResult({
					clientId: e.clientId,
					personId: this.#personId,
					venueSlug: data.venue.slug,
					showId: data.show.id,
					checkId: e.checkId,
					label,
					outcome: e.outcome,
					idleReading: e.idleReading ?? null,
					presentReading: e.presentReading ?? null,
					note: e.note ?? null,
					photo: null,
					recordedAt: e.at,
					expect: e.expect
				});
			}
			dropEarlierPending(data.show.id);
		} catch {
			// IndexedDB refused: they stay in localStorage for the next visit.
		}
	}

	/** Starts the outbox, live progress and board polling; answers the function that stops them. */
	start() {
		void this.moveEarlier().then(() => this.readOutbox());
		// A page opened without signal shows the copy kept on the phone; the checks say when it was saved.
		void this.refresh();
		const stopOutbox = watchOutbox(() => void this.readOutbox());
		const stop = watchShow(`${this.#api}/live`, () => this.refresh());
		void this.pollBoards();
		const boards = setInterval(() => {
			if (document.visibilityState === 'visible') void this.pollBoards();
		}, 4000);
		// Signal again: replace the kept copy with the server's.
		const goOnline = () => void this.refresh();
		window.addEventListener('online', goOnline);
		return () => {
			clearInterval(boards);
			stop();
			stopOutbox();
			window.removeEventListener('online', goOnline);
		};
	}
}
