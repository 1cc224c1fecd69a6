/** What a run sheet said, reduced to what a crew member would want told when it changes. */
export interface SheetSummary {
	/** 'Scheduled', 'Cancelled' or 'Dark'. */
	show: string;
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

/** The lines of a change notice: each field that differs, in the order a crew member reads them. */
export function sheetChanges(before: SheetSummary, after: SheetSummary): SheetChange[] {
	if (before.assigned && !after.assigned)
		return [{ what: 'Position', before: before.position, after: 'No longer assigned' }];
	if (!before.assigned && after.assigned)
		return [{ what: 'Position', before: 'Not assigned', after: after.position }];
	const out: SheetChange[] = [];
	const field = (what: string, a: string, b: string) => {
		if (a !== b) out.push({ what, before: a, after: b });
	};
	field('Show', before.show, after.show);
	field('Crew call', before.crewCall, after.crewCall);
	field('Doors', before.doors, after.doors);
	field('Position', before.position, after.position);
	field('Rooms', listed(before.rooms), listed(after.rooms));
	field('Scenes', listed(before.scenes), listed(after.scenes));
	field('Stood down', listed(before.stoodDown), listed(after.stoodDown));
	return out;
}
