import { describe, expect, it } from 'vitest';
import { cueClock, cueLine, responseLine } from './cues';
import { sheetChanges, type SheetSummary } from './changes';

const led = { name: 'Warm lanterns', kind: 'led' as const };
const valve = { name: 'Drop valve', kind: 'relay' as const };

describe('cue lines for crew', () => {
	it('writes scene times as m:ss, tenths only when needed', () => {
		// common practice, no published source: cue sheets give minutes and seconds from the go.
		expect(cueClock(0)).toBe('0:00');
		expect(cueClock(4000)).toBe('0:04');
		expect(cueClock(62_500)).toBe('1:02.5');
		expect(cueClock(599_960)).toBe('10:00');
	});

	it('says what each kind of cue does, in plain words', () => {
		expect(cueLine(0, { type: 'fade', level: 0.4, durationMs: 2000 }, led)).toBe(
			'0:00 fade Warm lanterns to 40 % over 2 s'
		);
		expect(cueLine(3000, { type: 'pulse', durationMs: 300 }, valve)).toBe(
			'0:03 pulse Drop valve for 0.3 s'
		);
		expect(cueLine(4000, { type: 'strobe', rateHz: 6, durationMs: 1500, level: 1 }, led)).toBe(
			'0:04 strobe Warm lanterns at 6 Hz for 1.5 s'
		);
		expect(cueLine(5000, { type: 'set', level: 0.25 }, led)).toBe('0:05 set Warm lanterns to 25 %');
		expect(cueLine(5000, { type: 'set', level: 1 }, valve)).toBe('0:05 switch Drop valve on');
		expect(cueLine(6000, { type: 'set', level: 0 }, valve)).toBe('0:06 switch Drop valve off');
		expect(responseLine('Warm lanterns', 'Well-lip plate')).toBe(
			'Live: Warm lanterns follows Well-lip plate'
		);
	});
});

describe('what changed between two run sheets', () => {
	const before: SheetSummary = {
		show: 'Scheduled',
		crewCall: '17:00',
		doors: '19:00–23:00',
		position: 'Room tech, Crow Loft',
		rooms: ['Crow Loft'],
		scenes: ['Feathers fall'],
		stoodDown: [],
		assigned: true
	};

	it('lists only the fields that differ, with before and after', () => {
		expect(sheetChanges(before, before)).toEqual([]);
		expect(
			sheetChanges(before, { ...before, crewCall: '16:30', stoodDown: ['Root hand plate'] })
		).toEqual([
			{ what: 'Crew call', before: '17:00', after: '16:30' },
			{ what: 'Stood down', before: 'None', after: 'Root hand plate' }
		]);
		expect(sheetChanges(before, { ...before, show: 'Cancelled' })).toEqual([
			{ what: 'Show', before: 'Scheduled', after: 'Cancelled' }
		]);
	});

	it('writes changed times in the venue clock, and a clock switch alone is no change', () => {
		// date-fns format 'h:mm aaa' writes 17:00 as '5:00 pm' and 23:30 as '11:30 pm'
		expect(
			sheetChanges(before, { ...before, crewCall: '16:30', doors: '19:00–23:30' }, '12h')
		).toEqual([
			{ what: 'Crew call', before: '5:00 pm', after: '4:30 pm' },
			{ what: 'Doors', before: '7:00 pm–11:00 pm', after: '7:00 pm–11:30 pm' }
		]);
		expect(sheetChanges(before, { ...before }, '12h')).toEqual([]);
	});

	it('says so when a person is taken off the show or put back on', () => {
		const off = { ...before, assigned: false };
		expect(sheetChanges(before, off)).toEqual([
			{ what: 'Position', before: 'Room tech, Crow Loft', after: 'No longer assigned' }
		]);
		expect(sheetChanges(off, before)).toEqual([
			{ what: 'Position', before: 'Not assigned', after: 'Room tech, Crow Loft' }
		]);
	});
});
