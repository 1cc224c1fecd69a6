import type { SeasonFields } from '../../src/lib/server/schedule/seasons';

// Fridays and Saturdays through October 2027, doors 19:00 to 23:00 London time.
export const autumn: SeasonFields = {
	name: 'Autumn 2027',
	firstNight: '2027-10-01',
	rule: 'FREQ=WEEKLY;BYDAY=FR,SA;UNTIL=20271031',
	doorsOpen: '19:00',
	doorsClose: '23:00',
	crewCallMinutesBefore: 120,
	darkNights: ['2027-10-16'],
	extraNights: [],
	openingNight: '2027-10-01'
};
