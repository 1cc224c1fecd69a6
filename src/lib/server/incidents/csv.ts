// A season's incidents as CSV for a spreadsheet: one line per incident, times written in the
// venue's zone as 2027-10-01 21:40, and every text cell that a spreadsheet would read as a formula
// defused with a leading apostrophe.
import { stringify } from 'csv-stringify/sync';
import { INCIDENT_KIND_LABELS } from '$lib/schemas/incident-words';
import { localDate, localTime } from '$lib/util/when';
import type { IncidentView } from './records';

/**
 * Cells starting with = + - @ (or a tab or carriage return) are run as formulas by spreadsheet
 * programs; an apostrophe in front makes them text. OWASP, "CSV Injection".
 */
export function defuse(cell: string): string {
	return /^[=+\-@\t\r]/.test(cell) ? `'${cell}` : cell;
}

export function incidentsCsv(list: IncidentView[], timeZone: string): string {
	const at = (d: Date) => `${localDate(d, timeZone)} ${localTime(d, timeZone, '24h')}`;
	const rows = [...list]
		.sort((a, b) => a.happenedAt.getTime() - b.happenedAt.getTime())
		.map((i) => {
			const closing = i.events.find((e) => e.kind === 'closed');
			const notes = i.events
				.filter((e) => e.kind === 'follow_up')
				.map((e) => `${at(e.at)}${e.by ? ` ${e.by}` : ''}: ${e.note}`)
				.join('\n');
			return [
				i.showDate,
				at(i.happenedAt),
				INCIDENT_KIND_LABELS[i.kind],
				i.roomName ?? '',
				i.whatHappened,
				i.whatWasDone,
				i.firstAid ? 'yes' : 'no',
				i.firstAidGiven ?? '',
				i.stoppedMinutes,
				i.reportedBy ?? '',
				i.followUpBy ?? '',
				notes,
				closing ? 'closed' : 'open',
				closing ? at(closing.at) : '',
				closing?.note ?? ''
			];
		});
	return stringify(rows, {
		header: true,
		columns: [
			'Night',
			`Time (${timeZone})`,
			'Kind',
			'Room',
			'What happened',
			'What was done',
			'First aid',
			'First aid given',
			'Show stopped (minutes)',
			'Reported by',
			'Follow-up owner',
			'Follow-up notes',
			'State',
			'Closed at',
			'Closing note'
		],
		cast: { string: defuse },
		record_delimiter: 'windows'
	});
}
