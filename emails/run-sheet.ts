import { telHref } from '../src/lib/util/tel';
import { zonePlace } from '../src/lib/util/when';
import { COLOURS, button, escapeHtml, facts, frame, heading, list, textHeading } from './layout';

export type RunSheetWarning =
	| { kind: 'strobe' | 'fog' | 'pneumatics' | 'mains'; note?: string }
	| { kind: 'stood_down'; prop: string; reason: string };

export interface RunSheetScene {
	name: string;
	room: string;
	/** One line per cue, already summarised ("0:04 pulse the drop valve 0.3 s"). */
	cues: string[];
	warnings: RunSheetWarning[];
}

export interface RunSheetData {
	venueName: string;
	address: string | null;
	/** Local date and times, already formatted in the venue's time zone. */
	dateLabel: string;
	crewCall: string;
	doors: string;
	timeZone: string;
	person: { name: string };
	position: string;
	rooms: string[];
	scenes: RunSheetScene[];
	/** Their lines of the night's checklist: their rooms' checks, and every safety check for a safety post. */
	checklist?: { room: string | null; item: string }[];
	/** Open faults on props in their rooms (every room for a safety post). */
	faults?: { room: string | null; prop: string; severity: string; seen: string }[];
	/** A safety post: it covers every room. */
	safetyPost?: boolean;
	/** For a safety post: every room's hazards, scene by scene. */
	hazards?: { room: string; scene: string; warnings: RunSheetWarning[] }[];
	/** A phone number, an e-mail address or both. */
	safetyContacts: {
		name: string;
		role: string | null;
		phone?: string | null;
		email?: string | null;
	}[];
	showStop: string[];
	/** The web version of this run sheet. */
	url?: string;
	/** Set on a run sheet sent again because something changed: what changed since the last one. */
	changes?: { what: string; before: string; after: string }[];
}

const WARNING_WORDS = {
	strobe: 'Strobe: photosensitivity signage must be up',
	fog: 'Fog: check detectors and ventilation',
	pneumatics: 'Pneumatics: keep clear of moving parts',
	mains: 'Mains-powered load: enclosures stay shut, wiring is for a licensed electrician'
} as const;

export function warningText(w: RunSheetWarning): string {
	if (w.kind === 'stood_down')
		return `Stood down tonight: ${w.prop}, held in safe state (${w.reason})`;
	return w.note ? `${WARNING_WORDS[w.kind]} (${w.note})` : WARNING_WORDS[w.kind];
}

export function runSheetSubject(d: Pick<RunSheetData, 'venueName' | 'dateLabel' | 'changes'>) {
	const base = `Run sheet for ${d.dateLabel} at ${d.venueName}`;
	return d.changes?.length ? `Changed: ${base}` : base;
}

function contactLine(c: RunSheetData['safetyContacts'][number]) {
	const how = [c.phone, c.email].filter(Boolean).join(', ');
	return `${c.name}${c.role ? ` (${c.role})` : ''}${how ? `: ${how}` : ''}`;
}

/** The same line with the phone number as a link a phone dials when tapped. */
function contactHtml(c: RunSheetData['safetyContacts'][number]) {
	const tel = telHref(c.phone);
	const phone = c.phone
		? tel
			? `<a href="${tel}" style="color:${COLOURS.lantern};font-weight:bold;">${escapeHtml(c.phone)}</a>`
			: escapeHtml(c.phone)
		: null;
	const how = [phone, c.email ? escapeHtml(c.email) : null].filter(Boolean).join(', ');
	return `<li style="margin:0 0 4px;"><strong>${escapeHtml(c.name)}</strong>${c.role ? ` (${escapeHtml(c.role)})` : ''}${how ? `: ${how}` : ''}</li>`;
}

/** The rooms line: a safety post covers every room; a post without a room says so plainly. */
export function roomsText(d: Pick<RunSheetData, 'rooms' | 'safetyPost'>) {
	if (d.safetyPost) return d.rooms.length ? `Every room (${d.rooms.join(', ')})` : 'Every room';
	return d.rooms.join(', ') || 'No room of your own';
}

export function renderRunSheet(d: RunSheetData) {
	const subject = runSheetSubject(d);
	const when: [string, string][] = [
		['Date', d.dateLabel],
		['Crew call', `${d.crewCall} (${zonePlace(d.timeZone)} time)`],
		['Doors', d.doors],
		['Position', d.position],
		['Rooms', roomsText(d)]
	];
	if (d.address) when.splice(1, 0, ['Where', d.address]);

	const sceneHtml = d.scenes
		.map((s) => {
			const warnings = s.warnings.length
				? `<table role="presentation" cellpadding="0" cellspacing="0" width="100%" style="margin:0 0 8px;border-left:4px solid ${COLOURS.ember};"><tr><td style="padding:6px 10px;color:${COLOURS.ember};font-weight:bold;">${s.warnings.map((w) => escapeHtml(warningText(w))).join('<br>')}</td></tr></table>`
				: '';
			return `<table role="presentation" cellpadding="0" cellspacing="0" width="100%" style="margin:0 0 12px;border:1px solid ${COLOURS.edge};border-radius:8px;"><tr><td style="padding:10px 12px;">
<p style="margin:0 0 6px;font-weight:bold;">${escapeHtml(s.name)} <span style="font-weight:normal;color:${COLOURS.muted};">· ${escapeHtml(s.room)}</span></p>
${warnings}${s.cues.length ? list(s.cues) : `<p style="margin:0;color:${COLOURS.muted};">No timed cues.</p>`}
</td></tr></table>`;
		})
		.join('');

	const checklist = d.checklist?.map((c) => (c.room ? `${c.room}: ${c.item}` : c.item));
	const faultLines = (d.faults ?? []).map(
		(f) => `${f.room ? `${f.room}, ` : ''}${f.prop} (${f.severity}): ${f.seen}`
	);
	const faultHtml = faultLines.length
		? `${heading('Open faults in your rooms')}\n${list(faultLines)}`
		: '';
	const faultText = faultLines.length
		? `\n${textHeading('Open faults in your rooms')}\n${faultLines.map((l) => `! ${l}`).join('\n')}\n`
		: '';
	const contacts = d.safetyContacts.map(contactLine);
	const hazards = d.hazards ?? [];
	const hazardLines = hazards.flatMap((h) =>
		h.warnings.map((w) => `${h.room}, ${h.scene}: ${warningText(w)}`)
	);
	const hazardHtml = d.safetyPost
		? `${heading('Hazards in every room')}
${hazardLines.length ? `<table role="presentation" cellpadding="0" cellspacing="0" width="100%" style="margin:0 0 8px;border-left:4px solid ${COLOURS.ember};"><tr><td style="padding:6px 10px;color:${COLOURS.ember};font-weight:bold;">${hazardLines.map(escapeHtml).join('<br>')}</td></tr></table>` : `<p style="margin:0;color:${COLOURS.muted};">No strobes, fog, pneumatics or mains loads run tonight.</p>`}`
		: '';
	const changes = d.changes ?? [];
	const changeHtml = changes.length
		? `${heading('What changed')}<table role="presentation" cellpadding="0" cellspacing="0" width="100%" style="margin:0 0 12px;border-left:4px solid ${COLOURS.lantern};">${changes
				.map(
					(c) =>
						`<tr><td style="padding:4px 10px;font-weight:bold;vertical-align:top;">${escapeHtml(c.what)}</td><td style="padding:4px 10px;vertical-align:top;">${escapeHtml(c.after)} <span style="color:${COLOURS.muted};">(was ${escapeHtml(c.before)})</span></td></tr>`
				)
				.join('')}</table>`
		: '';
	const checklistHtml = checklist
		? `${heading('Your checks before doors')}
${checklist.length ? list(checklist) : `<p style="margin:0;color:${COLOURS.muted};">No checks assigned to you.</p>`}`
		: '';

	const html = frame(
		subject,
		`<p style="margin:0 0 12px;">${escapeHtml(d.person.name)}, here is your ${changes.length ? 'changed ' : ''}run sheet for ${escapeHtml(d.venueName)}.</p>
${changeHtml}
${facts(when)}
${d.url ? button(d.url, 'Open the run sheet') : ''}
${hazardHtml}
${heading('Scenes in your rooms')}
${sceneHtml || `<p style="margin:0;color:${COLOURS.muted};">No scenes run in your rooms tonight.</p>`}
${checklistHtml}
${faultHtml}
${heading('Safety contacts')}
${contacts.length ? `<ul style="margin:0 0 8px;padding-left:22px;">${d.safetyContacts.map(contactHtml).join('')}</ul>` : `<p style="margin:0;color:${COLOURS.muted};">Ask the show manager.</p>`}
${heading('Show stop')}
${list(d.showStop, true)}
<p style="margin:16px 0 0;color:${COLOURS.muted};font-size:14px;">Local codes and the authority having jurisdiction come first. If in doubt, stop the show.</p>`
	);

	const sceneText = d.scenes
		.map((s) =>
			[
				`* ${s.name} (${s.room})`,
				...s.warnings.map((w) => `  ! ${warningText(w)}`),
				...(s.cues.length ? s.cues.map((c) => `  - ${c}`) : ['  - No timed cues.'])
			].join('\n')
		)
		.join('\n');
	const changeText = changes.length
		? `\n${textHeading('What changed')}\n${changes.map((c) => `${c.what}: ${c.after} (was ${c.before})`).join('\n')}\n`
		: '';
	const hazardText = d.safetyPost
		? `\n${textHeading('Hazards in every room')}\n${hazardLines.length ? hazardLines.map((l) => `! ${l}`).join('\n') : 'No strobes, fog, pneumatics or mains loads run tonight.'}\n`
		: '';
	const checklistText = checklist
		? `\n${textHeading('Your checks before doors')}\n${checklist.length ? checklist.map((c) => `[ ] ${c}`).join('\n') : 'No checks assigned to you.'}\n`
		: '';
	const text = `${d.person.name}, here is your ${changes.length ? 'changed ' : ''}run sheet for ${d.venueName}.
${changeText}
${when.map(([k, v]) => `${k}: ${v}`).join('\n')}
${d.url ? `\nOpen the run sheet: ${d.url}\n` : ''}${hazardText}
${textHeading('Scenes in your rooms')}
${sceneText || 'No scenes run in your rooms tonight.'}
${checklistText}${faultText}
${textHeading('Safety contacts')}
${contacts.length ? contacts.join('\n') : 'Ask the show manager.'}

${textHeading('Show stop')}
${d.showStop.map((s, i) => `${i + 1}. ${s}`).join('\n')}

Local codes and the authority having jurisdiction come first. If in doubt, stop the show.
`;
	return { subject, html, text };
}
