/** When crew must arrive: doors open minus the offset, counted in real minutes. */
export function crewCallAt(doorsOpen: Date, minutesBefore: number): Date {
	if (!Number.isFinite(minutesBefore) || minutesBefore < 0) {
		throw new RangeError('Crew call must be zero or more minutes before doors.');
	}
	return new Date(doorsOpen.getTime() - minutesBefore * 60_000);
}

/** One person at one position of one show, from crew call until they are released. */
export interface CrewAssignment {
	id?: string;
	personId: string;
	showId: string;
	venueId?: string;
	callAt: Date;
	endsAt: Date;
}

export interface DoubleBooking {
	personId: string;
	first: CrewAssignment;
	second: CrewAssignment;
	/** The time both assignments claim. */
	from: Date;
	to: Date;
	sameShow: boolean;
}

/**
 * Pairs of assignments for the same person whose times overlap, across every show and venue given.
 * One ending exactly when the next starts is not an overlap. Assignments with no length are skipped.
 */
export function findDoubleBookings(assignments: CrewAssignment[]): DoubleBooking[] {
	const byPerson = new Map<string, CrewAssignment[]>();
	for (const a of assignments) {
		if (!(a.endsAt.getTime() > a.callAt.getTime())) continue;
		const list = byPerson.get(a.personId) ?? [];
		list.push(a);
		byPerson.set(a.personId, list);
	}
	const found: DoubleBooking[] = [];
	for (const [personId, list] of byPerson) {
		list.sort((a, b) => a.callAt.getTime() - b.callAt.getTime());
		for (let i = 0; i < list.length; i++) {
			for (let j = i + 1; j < list.length; j++) {
				const [a, b] = [list[i], list[j]];
				if (b.callAt.getTime() >= a.endsAt.getTime()) break;
				found.push({
					personId,
					first: a,
					second: b,
					from: b.callAt,
					to: new Date(Math.min(a.endsAt.getTime(), b.endsAt.getTime())),
					sameShow: a.showId === b.showId
				});
			}
		}
	}
	return found.sort((x, y) => x.from.getTime() - y.from.getTime());
}
