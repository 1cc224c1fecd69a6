/**
 * What was last typed into a page's date and time inputs, by input id, so the page can echo it in
 * the venue's words while the person types. Listen with `oninput={typed.input}` on a form (or the
 * input) and `onreset={typed.reset}`; `get(id, fallback)` gives the typed value or the fallback.
 */
export class Typed {
	#values = $state<Record<string, string>>({});

	input = (e: Event) => {
		const el = e.target;
		if (el instanceof HTMLInputElement && el.id) this.#values[el.id] = el.value;
	};

	reset = () => {
		this.#values = {};
	};

	get(id: string, fallback: string): string {
		return this.#values[id] ?? fallback;
	}
}
