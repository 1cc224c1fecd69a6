import { describe, expect, it } from 'vitest';
import {
	calendarRangeSchema,
	MOVE_SHOW_BODY,
	moveShowSchema,
	seasonFormSchema
} from '../../src/lib/schemas/schedule';

describe('calendar range', () => {
	it('refuses nonsense, backwards and very long ranges without throwing', () => {
		expect(calendarRangeSchema.safeParse({ start: 'nonsense', end: '2027-11-01' }).success).toBe(
			false
		);
		expect(calendarRangeSchema.safeParse({ start: '2027-11-01', end: '2027-10-01' }).success).toBe(
			false
		);
		expect(calendarRangeSchema.safeParse({ start: '2027-01-01', end: '2029-01-01' }).success).toBe(
			false
		);
		expect(calendarRangeSchema.safeParse({}).success).toBe(false);
		expect(
			calendarRangeSchema.parse({ start: '2027-09-27T00:00:00', end: '2027-11-08T00:00:00' })
		).toEqual({ start: '2027-09-27', end: '2027-11-08' });
	});
});

describe('season form', () => {
	const base = {
		name: 'Autumn',
		firstNight: '2027-10-01',
		doorsOpen: '19:00',
		doorsClose: '23:00',
		crewCallMinutesBefore: '120'
	};
	it('builds an RRULE from the nights of the week', () => {
		const parsed = seasonFormSchema.parse({
			...base,
			nights: ['SA', 'FR'],
			until: '2027-10-31',
			darkNights: '2027-10-16'
		});
		// RFC 5545 §3.3.10: WEEKLY with BYDAY and a date UNTIL.
		expect(parsed.rule).toBe('FREQ=WEEKLY;BYDAY=FR,SA;UNTIL=20271031');
		expect(parsed.darkNights).toEqual(['2027-10-16']);
	});
	it('explains a bad typed rule beside the rule field', () => {
		const parsed = seasonFormSchema.safeParse({ ...base, ruleMode: 'typed', rule: 'FREQ=HOURLY' });
		expect(parsed.success).toBe(false);
		expect(parsed.error!.issues[0].path).toEqual(['rule']);
	});
	it('asks for a night of the week and a date in the dark nights', () => {
		expect(seasonFormSchema.safeParse({ ...base, until: '2027-10-31' }).success).toBe(false);
		expect(
			seasonFormSchema.safeParse({ ...base, nights: 'FR', until: '2027-10-31', darkNights: 'soon' })
				.success
		).toBe(false);
	});
});

describe('moving a show', () => {
	const first = (body: unknown) => moveShowSchema.safeParse(body).error?.issues[0]?.message;
	it('answers a missing or non-object body in words for people, not the parser', () => {
		expect(first(null)).toBe(MOVE_SHOW_BODY);
		expect(first('2026-10-16')).toBe(MOVE_SHOW_BODY);
		expect(MOVE_SHOW_BODY).toMatch(/^Send a JSON body with showId/);
		expect(first({ date: '2026-10-16' })).toBe('Say which show to move (showId).');
		expect(first({ showId: crypto.randomUUID(), date: '16/10/2026' })).toBe(
			'Give the new date as YYYY-MM-DD.'
		);
	});
});
