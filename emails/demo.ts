// Invented sample data for the template preview. None of it is a real person or place.
import { renderInvitation } from './invitation';
import { renderRunSheet, type RunSheetData } from './run-sheet';
import { renderScheduleChange, type ScheduleChangeData } from './schedule-change';
import { renderSignInLink } from './sign-in-link';

export function demoRunSheet(venueName: string, origin: string): RunSheetData {
	return {
		venueName,
		address: '14 Lantern Lane, Ashcombe',
		dateLabel: 'Saturday 31 October 2026',
		crewCall: '17:30',
		doors: '19:00',
		timeZone: 'Europe/London',
		person: { name: 'Morwen Tally' },
		position: 'Room tech, Crow Loft',
		rooms: ['Crow Loft', 'Root Cellar'],
		scenes: [
			{
				name: 'Feathers fall',
				room: 'Crow Loft',
				cues: [
					'0:00 fade wing lights to 40 % over 2 s',
					'0:03 pulse the drop valve for 0.3 s',
					'0:04 flicker the loft strobe for 1.5 s'
				],
				warnings: [{ kind: 'strobe', note: '4 flashes per second' }, { kind: 'pneumatics' }]
			},
			{
				name: 'Breathing roots',
				room: 'Root Cellar',
				cues: ['Live: roots brighten with hand depth', '0:00 fog burst for 2 s'],
				warnings: [
					{ kind: 'fog' },
					{
						kind: 'stood_down',
						prop: 'Root hand plate',
						reason: 'plate cracked, sensor reads wild'
					}
				]
			}
		],
		checklist: [
			{ room: 'Crow Loft', item: 'Drop valve: idle reading inside the baseline band' },
			{ room: 'Crow Loft', item: 'Strobe signage at the loft entrance' },
			{ room: 'Root Cellar', item: 'Fog fluid above the line' },
			{ room: null, item: 'Exits lit and clear on your route' }
		],
		safetyContacts: [
			{ name: 'Ide Brannock', role: 'Safety lead', phone: '+44 7700 900123' },
			{ name: 'Ashcombe Fire Station', role: null, phone: '999' }
		],
		showStop: [
			'Press the nearest stop button: lights come up full, valves and fog go off.',
			'Call "show stop" on the radio and say which room.',
			'Guide guests to the nearest lit exit; do not restart until the safety lead says so.'
		],
		url: new URL('/v/demo/run-sheet', origin).toString()
	};
}

export function demoScheduleChange(venueName: string, origin: string): ScheduleChangeData {
	return {
		venueName,
		dateLabel: 'Saturday 31 October 2026',
		person: { name: 'Morwen Tally' },
		changes: [
			{ what: 'Crew call', before: '17:30', after: '17:00' },
			{ what: 'Position', before: 'Queue line', after: 'Room tech, Crow Loft' }
		],
		note: 'Doors open half an hour early for the late-night group.',
		url: new URL('/v/demo/run-sheet', origin).toString()
	};
}

/** Every template rendered with sample data, in the order the preview shows them. */
export function demoMails(venueName: string, origin: string) {
	return [
		{
			id: 'sign-in-link',
			label: 'Sign-in link',
			mail: renderSignInLink({
				url: new URL('/sign-in/sample-link', origin).toString(),
				email: 'morwen.tally@example.test'
			})
		},
		{
			id: 'invitation',
			label: 'Invitation',
			mail: renderInvitation({
				url: new URL('/invitations/sample-token', origin).toString(),
				venueName,
				roleLabel: 'Crew',
				invitedBy: 'Ide Brannock',
				expiresOn: '14 November 2026'
			})
		},
		{ id: 'run-sheet', label: 'Run sheet', mail: renderRunSheet(demoRunSheet(venueName, origin)) },
		{
			id: 'schedule-change',
			label: 'Schedule change',
			mail: renderScheduleChange(demoScheduleChange(venueName, origin))
		}
	];
}
