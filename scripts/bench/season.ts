// Benchmark, not a test: `node --import tsx scripts/bench/season.ts` (part of `npm run bench`).
// Expands a 365-night season in a zone with two clock changes and some dark nights, through the
// app's expandSeason, and has rrule expand the same rule in the same zone, alternating; prints the
// median time of each as JSON.
import { RRule } from '../../src/lib/schedule/rrule';
import { expandSeason, type SeasonInput } from '../../src/lib/schedule/season';

const darkNights = ['2027-03-14', '2027-07-04', '2027-11-07', '2027-12-25'];
const input: SeasonInput = {
	timeZone: 'America/New_York',
	firstNight: '2027-01-01',
	rule: 'FREQ=DAILY;COUNT=365',
	doorsOpen: '19:00',
	doorsClose: '23:30',
	crewCallMinutesBefore: 90,
	darkNights
};
const rrule = () =>
	new RRule({
		freq: RRule.DAILY,
		count: 365,
		dtstart: new Date(Date.UTC(2027, 0, 1, 19, 0)),
		tzid: null
	}).all();

const median = (xs: number[]) => xs.sort((a, b) => a - b)[Math.floor(xs.length / 2)];
const times = { app: [] as number[], rrule: [] as number[] };
let nights = 0;
for (let i = 0; i < 230; i++) {
	let t = performance.now();
	nights = expandSeason(input).length;
	const app = performance.now() - t;
	t = performance.now();
	const own = rrule().length;
	const lib = performance.now() - t;
	if (own !== 365) throw new Error(`rrule gave ${own} nights`);
	// The first rounds warm the code up and are left out.
	if (i >= 30) {
		times.app.push(app);
		times.rrule.push(lib);
	}
}
console.log(JSON.stringify({ nights, appMs: median(times.app), rruleMs: median(times.rrule) }));
