import {
	roomsText,
	runSheetSubject,
	warningText,
	type RunSheetData
} from '../src/lib/runsheets/sheet';
import { zonePlace } from '../src/lib/util/when';
import { renderHtml, textHeading } from './render';
import RunSheetMail from './RunSheetMail.svelte';

export {
	roomsText,
	runSheetSubject,
	warningText,
	type RunSheetData,
	type RunSheetScene,
	type RunSheetWarning
} from '../src/lib/runsheets/sheet';

function contactLine(c: RunSheetData['safetyContacts'][number]) {
	const how = [c.phone, c.email].filter(Boolean).join(', ');
	return `${c.name}${c.role ? ` (${c.role})` : ''}${how ? `: ${how}` : ''}`;
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

	const checklist = d.checklist?.map((c) => (c.room ? `${c.room}: ${c.item}` : c.item));
	const faultLines = (d.faults ?? []).map(
		(f) => `${f.room ? `${f.room}, ` : ''}${f.prop} (${f.severity}): ${f.seen}`
	);
	const faultText = faultLines.length
		? `\n${textHeading('Open faults in your rooms')}\n${faultLines.map((l) => `! ${l}`).join('\n')}\n`
		: '';
	const contacts = d.safetyContacts.map(contactLine);
	const hazardLines = (d.hazards ?? []).flatMap((h) =>
		h.warnings.map((w) => `${h.room}, ${h.scene}: ${warningText(w)}`)
	);
	const changes = d.changes ?? [];
	const html = renderHtml(RunSheetMail, { subject, d });

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
