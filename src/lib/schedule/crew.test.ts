import { describe, expect, it } from 'vitest';
import { crewCallAt, findDoubleBookings, type CrewAssignment } from './crew';

const at = (iso: string) => new Date(iso);

describe('crewCallAt', () => {
	it('is doors open minus the offset', () => {
		// Technical crew call about 2 h before doors (stage-management handbooks).
		expect(crewCallAt(at('2026-10-30T23:00:00Z'), 120).toISOString()).toBe(
			'2026-10-30T21:00:00.000Z'
		);
	});

	it('refuses a negative offset', () => {
		expect(() => crewCallAt(at('2026-10-30T23:00:00Z'), -5)).toThrow(/zero or more/);
	});
});

describe('findDoubleBookings', () => {
	const assignment = (
		id: string,
		personId: string,
		showId: string,
		venueId: string,
		callAt: string,
		endsAt: string
	): CrewAssignment => ({ id, personId, showId, venueId, callAt: at(callAt), endsAt: at(endsAt) });

	it('flags one person booked at two venues at once', () => {
		const found = findDoubleBookings([
			assignment('a1', 'ana', 'hollow-1', 'hollow', '2026-10-30T17:00:00Z', '2026-10-30T23:00:00Z'),
			assignment('a2', 'ana', 'mill-1', 'mill', '2026-10-30T21:30:00Z', '2026-10-31T02:00:00Z'),
			assignment('b1', 'ben', 'mill-1', 'mill', '2026-10-30T21:30:00Z', '2026-10-31T02:00:00Z')
		]);
		expect(found).toHaveLength(1);
		expect(found[0].personId).toBe('ana');
		expect([found[0].first.id, found[0].second.id]).toEqual(['a1', 'a2']);
		expect(found[0].from.toISOString()).toBe('2026-10-30T21:30:00.000Z');
		expect(found[0].to.toISOString()).toBe('2026-10-30T23:00:00.000Z');
		expect(found[0].sameShow).toBe(false);
	});

	it('lets one booking end exactly when the next starts', () => {
		expect(
			findDoubleBookings([
				assignment('a1', 'ana', 's1', 'v', '2026-10-30T12:00:00Z', '2026-10-30T17:00:00Z'),
				assignment('a2', 'ana', 's2', 'v', '2026-10-30T17:00:00Z', '2026-10-30T23:00:00Z')
			])
		).toEqual([]);
	});

	it('flags two positions in the same show, and every overlapping pair', () => {
		const found = findDoubleBookings([
			assignment('c', 'ana', 's1', 'v', '2026-10-30T19:00:00Z', '2026-10-30T20:00:00Z'),
			assignment('a', 'ana', 's1', 'v', '2026-10-30T17:00:00Z', '2026-10-30T23:00:00Z'),
			assignment('b', 'ana', 's1', 'v', '2026-10-30T18:00:00Z', '2026-10-30T22:00:00Z')
		]);
		expect(found.map((f) => `${f.first.id}${f.second.id}`).sort()).toEqual(['ab', 'ac', 'bc']);
		expect(found.every((f) => f.sameShow)).toBe(true);
	});

	it('skips assignments with no length', () => {
		expect(
			findDoubleBookings([
				assignment('a', 'ana', 's1', 'v', '2026-10-30T19:00:00Z', '2026-10-30T19:00:00Z'),
				assignment('b', 'ana', 's2', 'v', '2026-10-30T18:00:00Z', '2026-10-30T22:00:00Z')
			])
		).toEqual([]);
	});
});
