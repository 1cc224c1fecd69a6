/** What a failed action sent back, read per action and field: its errors and what was typed. */
export type Echo = {
	err: (action: string, field: string) => string[] | undefined;
	val: (action: string, field: string, fallback: string) => string;
};

export function echoOf(form: unknown): Echo {
	const f = form as {
		action?: string;
		errors?: Record<string, string[]>;
		values?: Record<string, string>;
	} | null;
	return {
		err: (action, field) => (f?.action === action ? f.errors?.[field] : undefined),
		val: (action, field, fallback) =>
			f?.action === action && f.values ? (f.values[field] ?? fallback) : fallback
	};
}
