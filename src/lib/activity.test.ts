import { describe, expect, it } from 'vitest';
import { activitySentence, referencedIds, type ActivityRefs, type Part } from './activity';

const SHOW = '0b6f3a52-1c1e-4c1a-9a51-5f1c2d7e9a10';
const PERSON = '7d2c0b1e-3f4a-4b5c-8d6e-9f0a1b2c3d4e';
const GONE = 'f1e2d3c4-b5a6-4978-8a6b-5c4d3e2f1a0b';
const SCENE = '2a3b4c5d-6e7f-4a8b-9c0d-1e2f3a4b5c6d';

const refs: ActivityRefs = {
	base: '/v/hollow-pines-trail',
	people: new Map([[PERSON, 'Odile Varn']]),
	shows: new Map([[SHOW, '2026-10-31']]),
	scenes: new Map([[SCENE, 'Well of whispers']]),
	props: new Map(),
	clock: '24h'
};

const text = (parts: Part[]) => parts.map((p) => (typeof p === 'string' ? p : p.text)).join('');
const links = (parts: Part[]) =>
	parts.filter((p): p is { text: string; href: string } => typeof p !== 'string');

// Every action key the app records (grep "action: '" in src), with the details it stores.
const RECORDED: [string, Record<string, unknown>][] = [
	['venue.created', { name: 'Hollow Pines Trail' }],
	['room.added', { name: 'Bone Orchard' }],
	['controller.removed', { name: 'Board A', propsSetToNone: 2 }],
	['capture.uploaded', { file: 'plate.csv', rows: 12000, sensor: 'Plate' }],
	['season.changed', { name: 'Autumn', added: 1, updated: 0, removed: 3 }],
	['member.role_changed', { personId: PERSON, from: 'crew', to: 'show_manager' }],
	['member.removed', { personId: GONE, role: 'crew' }],
	['show.added', { date: '2026-10-31', show: SHOW }],
	['show.changed', { show: SHOW, doorsOpen: '19:00', doorsClose: '23:00', crewCall: '18:00' }],
	['show.status', { show: SHOW, status: 'dark' }],
	['show.assigned', { show: SHOW, person: PERSON, position: 'Queue line' }],
	['show.unassigned', { show: SHOW, person: PERSON, position: 'Queue line' }],
	['show.scene_left_out', { show: SHOW, scene: SCENE }],
	['show.prop_stood_down', { show: SHOW, prop: 'Hand in the well', reason: 'Plate reads high' }],
	[
		'show.signed_off',
		{
			show: SHOW,
			checks: 41,
			stoodDown: ['Hand in the well'],
			acknowledged: ['a', 'b'],
			note: null
		}
	],
	['run_sheets.sent', { show: SHOW, queued: 6, unchanged: 2 }],
	['prop.file_uploaded', { file: 'wiring.pdf', propId: GONE }],
	['incident.reported', { show: SHOW, date: '2026-10-31', kind: 'near_miss', stoppedMinutes: 0 }],
	['incident.followed_up', { show: SHOW, date: '2026-10-31', kind: 'guest_injury' }],
	['incident.closed', { show: SHOW, date: '2026-10-31', kind: 'show_stop' }]
];

describe('activitySentence', () => {
	it.each(RECORDED)('%s reads as words: no keys, ids, null or undefined', (action, detail) => {
		const words = text(activitySentence(action, detail, refs));
		expect(words).not.toMatch(/[0-9a-f]{8}-[0-9a-f]{4}-/i);
		expect(words).not.toMatch(/\bnull\b|\bundefined\b|\[object|NaN/);
		expect(words).not.toContain(action);
		expect(words).not.toMatch(/[a-z]+_[a-z]+/); // no snake_case field names or role keys
		expect(words.trim().length).toBeGreaterThan(5);
	});

	it("writes a show's new times in the venue's clock", () => {
		const detail = { show: SHOW, doorsOpen: '19:00', doorsClose: '23:00', crewCall: '18:00' };
		// date-fns format 'h:mm aaa' writes 19:00 as '7:00 pm'
		expect(text(activitySentence('show.changed', detail, { ...refs, clock: '12h' }))).toContain(
			': doors 7:00 pm–11:00 pm, crew call 6:00 pm'
		);
		expect(text(activitySentence('show.changed', detail, refs))).toContain(
			': doors 19:00–23:00, crew call 18:00'
		);
	});

	it('names people and links the show that still exists', () => {
		const parts = activitySentence(
			'show.assigned',
			{ show: SHOW, person: PERSON, position: 'Queue line' },
			refs
		);
		expect(text(parts)).toBe('put Odile Varn on “Queue line” for the show on Sat 31 Oct 2026');
		expect(links(parts)).toEqual([
			{ text: 'the show on Sat 31 Oct 2026', href: `/v/hollow-pines-trail/shows/${SHOW}` }
		]);
	});

	it('says "a former member" for someone no longer found, and does not link a removed prop', () => {
		expect(text(activitySentence('member.removed', { personId: GONE, role: 'crew' }, refs))).toBe(
			'removed a former member (crew) from the venue'
		);
		const parts = activitySentence(
			'prop.file_uploaded',
			{ file: 'wiring.pdf', propId: GONE },
			refs
		);
		expect(links(parts)).toEqual([]);
		expect(text(parts)).toBe('uploaded the file “wiring.pdf” to a prop');
	});

	it('says what happened at an incident and links the night’s incidents', () => {
		const reported = activitySentence(
			'incident.reported',
			{ show: SHOW, date: '2026-10-31', kind: 'guest_injury', stoppedMinutes: 12 },
			refs
		);
		expect(text(reported)).toBe(
			'reported a guest injury on the show on Sat 31 Oct 2026 (the show stopped for 12 minutes)'
		);
		expect(links(reported)).toEqual([
			{ text: 'the show on Sat 31 Oct 2026', href: `/v/hollow-pines-trail/shows/${SHOW}/incidents` }
		]);
		expect(
			text(activitySentence('incident.followed_up', { show: SHOW, kind: 'evacuation' }, refs))
		).toBe('added a follow-up note to an evacuation on the show on Sat 31 Oct 2026');
		// A kind this version does not know, and a night since removed.
		expect(
			text(activitySentence('incident.closed', { show: GONE, kind: 'meteor', date: 'x' }, refs))
		).toBe('closed an incident on a show');
	});

	it('counts with thousands separators and singulars', () => {
		expect(
			text(
				activitySentence('capture.uploaded', { file: 'p.csv', rows: 12000, sensor: 'Plate' }, refs)
			)
		).toBe('uploaded the capture “p.csv” (12,000 readings) for the sensor “Plate”');
		expect(text(activitySentence('season.added', { name: 'Autumn', shows: 1 }, refs))).toBe(
			'added the season “Autumn” with 1 show'
		);
	});

	it('reads an action it does not know as words, and survives a detail that is not an object', () => {
		expect(text(activitySentence('cue_list.reordered', null, refs))).toBe('reordered a cue list');
		expect(text(activitySentence('show.status', 'garbage', refs))).toBe('marked a show changed');
	});
});

describe('referencedIds', () => {
	it('collects only id-shaped values, by kind', () => {
		expect(
			referencedIds('show.scene_left_out', { show: SHOW, scene: SCENE, person: 'not-an-id' })
		).toEqual({ people: [], shows: [SHOW], scenes: [SCENE], props: [] });
	});
});
