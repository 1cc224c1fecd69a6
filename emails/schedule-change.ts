import { renderHtml } from './render';
import ScheduleChange from './ScheduleChange.svelte';

export interface ScheduleChangeData {
	venueName: string;
	/** The show's local date, formatted. */
	dateLabel: string;
	person: { name: string };
	/** What changed for this person: "Crew call", "Position", "Scene in Crow Loft"… */
	changes: { what: string; before: string; after: string }[];
	note?: string;
	url?: string;
}

export function renderScheduleChange(d: ScheduleChangeData) {
	const subject = `Schedule change for ${d.dateLabel} at ${d.venueName}`;
	const html = renderHtml(ScheduleChange, { subject, d });
	const text = `${d.person.name}, something changed for your night at ${d.venueName} on ${d.dateLabel}.

${d.changes.map((c) => `${c.what}: ${c.after} (was ${c.before})`).join('\n')}
${d.note ? `\n${d.note}\n` : ''}${d.url ? `\nOpen your run sheet: ${d.url}\n` : ''}`;
	return { subject, html, text };
}
