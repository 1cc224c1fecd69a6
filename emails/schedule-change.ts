import { COLOURS, button, escapeHtml, frame } from './layout';

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
	const rows = d.changes
		.map(
			(c) =>
				`<tr><td style="padding:6px 10px;border-top:1px solid ${COLOURS.edge};font-weight:bold;vertical-align:top;">${escapeHtml(c.what)}</td><td style="padding:6px 10px;border-top:1px solid ${COLOURS.edge};color:${COLOURS.muted};text-decoration:line-through;vertical-align:top;">${escapeHtml(c.before)}</td><td style="padding:6px 10px;border-top:1px solid ${COLOURS.edge};font-weight:bold;color:${COLOURS.lantern};vertical-align:top;">${escapeHtml(c.after)}</td></tr>`
		)
		.join('');
	const html = frame(
		subject,
		`<p style="margin:0 0 12px;">${escapeHtml(d.person.name)}, something changed for your night at ${escapeHtml(d.venueName)} on ${escapeHtml(d.dateLabel)}.</p>
<table cellpadding="0" cellspacing="0" width="100%" style="border-collapse:collapse;margin:0 0 12px;">
<tr><th align="left" style="padding:6px 10px;color:${COLOURS.muted};font-size:14px;">What</th><th align="left" style="padding:6px 10px;color:${COLOURS.muted};font-size:14px;">Was</th><th align="left" style="padding:6px 10px;color:${COLOURS.muted};font-size:14px;">Now</th></tr>
${rows}
</table>
${d.note ? `<p style="margin:0 0 12px;">${escapeHtml(d.note)}</p>` : ''}
${d.url ? button(d.url, 'Open your run sheet') : ''}`
	);
	const text = `${d.person.name}, something changed for your night at ${d.venueName} on ${d.dateLabel}.

${d.changes.map((c) => `${c.what}: ${c.after} (was ${c.before})`).join('\n')}
${d.note ? `\n${d.note}\n` : ''}${d.url ? `\nOpen your run sheet: ${d.url}\n` : ''}`;
	return { subject, html, text };
}
