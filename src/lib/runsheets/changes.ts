import { clockTime, type Clock } from '../util/when';

/** What a run sheet said, reduced to what a crew member would want told when it changes. */
export interface SheetSummary {
	/** 'Scheduled', 'Cancelled' or 'Dark'. */
	show: string;
	/** Local times on the 24-hour clock ('18:30', '19:30–23:00'), so a change of clock is no change. */
	crewCall: string;
	doors: string;
	position: string;
	rooms: string[];
	scenes: string[];
	stoodDown: string[];
	assigned: boolean;
}

export interface SheetChange {
	what: string;
	before: string;
	after: string;
}

const listed = (xs: string[]) => (xs.length ? xs.join(', ') : 'None');

/** Every HH:MM in a summary's times in the venue's clock: '19:30–23:00' → '7:30 pm–11:00 pm'. */
const inClock = (times: string, clock: Clock) =>
	times.replace(/\b\d{1,2}:\d{2}\b/g, (t) => clockTime(t, clock));

/** The lines of a change notice: each field that differs, in the order a crew member reads them. */
export function sheetChanges(
	before: SheetSummary,
	after: SheetSummary,
	clock: Clock = '24h'
): SheetChange[] {
	if (before.assigned && !after.assigned)
		return [{ what: 'Position', before: before.position, after: 'No longer assigned' }];
	if (!before.assigned && after.assigned)
		return [{ what: 'Position', before: 'Not assigned', after: after.position }];
	const out: SheetChange[] = [];
	const field = (what: string, a: string, b: string) => {
		if (a !== b) out.push({ what, before: a, after: b });
	};
	field('Show', before.show, after.show);
	if (before.crewCall !== after.crewCall)
		out.push({
			what: 'Crew call',
			before: inClock(before.crewCall, clock),
			after: inClock(after.crewCall, clock)
		});
	if (before.doors !== after.doors)
		out.push({
			what: 'Doors',
			before: inClock(before.doors, clock),
			after: inClock(after.doors, clock)
		});
	field('Position', before.position, after.position);
	field('Rooms', listed(before.rooms), listed(after.rooms));
	field('Scenes', listed(before.scenes), listed(after.scenes));
	field('Stood down', listed(before.stoodDown), listed(after.stoodDown));
	return out;
}
