import { describe, expect, it } from 'vitest';
import { describeChange, type SceneVersion } from './changes';

const details = {
	name: 'Well',
	roomId: null,
	trigger: 'sensor',
	triggerSensorId: 's1',
	loopMs: null,
	lengthMs: 10_000,
	rearmMs: 5_000,
	runsOnShowNights: true,
	notes: ''
};
const set = (id: string, outputId: string, startMs: number, level = 1) => ({
	id,
	outputId,
	startMs,
	action: { type: 'set', level }
});
const version = (extra: Partial<SceneVersion> = {}): SceneVersion => ({
	details,
	cues: [set('c1', 'lantern', 0), set('c2', 'lantern', 2000)],
	responses: [{ id: 'r1', sensorId: 's1', outputId: 'lantern', shape: 'rise' }],
	...extra
});
const names: Record<string, string> = { lantern: 'Lantern', fan: 'Fan' };
const described = (before: SceneVersion, after: SceneVersion) =>
	describeChange(before, after, (id) => names[id] ?? 'a removed output');

describe('describeChange', () => {
	it('says nothing when nothing changed, even when a missing value meets a null one', () => {
		const before = version();
		const after = version({
			details: { ...details, notes: '' },
			responses: [{ ...before.responses[0], threshold: null }]
		});
		const change = described(before, after);
		expect(change.summary).toBe('');
		expect(change.detail).toEqual({
			fields: [],
			cues: { added: 0, changed: 0, removed: 0 },
			responses: { added: 0, changed: 0, removed: 0 }
		});
	});

	it('names the changed details in their words, in a fixed order', () => {
		const after = version({ details: { ...details, rearmMs: 0, name: 'Deep well' } });
		const change = described(version(), after);
		expect(change.summary).toBe('Changed the name, re-arm time.');
		expect(change.detail.fields).toEqual(['name', 'rearmMs']);
	});

	it('counts cues added, moved and removed, with their lanes', () => {
		const after = version({
			cues: [set('c1', 'lantern', 500), set('c3', 'fan', 0), set('c4', 'fan', 100)]
		});
		const change = described(version(), after);
		expect(change.summary).toBe(
			'Added 2 cues on Fan; moved or edited 1 cue on Lantern; removed 1 cue from Lantern.'
		);
		expect(change.detail.cues).toEqual({ added: 2, changed: 1, removed: 1 });
	});

	it('counts responses, and names a lane whose output is gone', () => {
		const before = version();
		const after = version({
			responses: [
				{ ...before.responses[0], maxLevel: 0.5 },
				{ id: 'r2', sensorId: 's1', outputId: 'gone' }
			]
		});
		const change = described(before, after);
		expect(change.summary).toBe('Added 1 response on a removed output; changed 1 response.');
		expect(change.detail.responses).toEqual({ added: 1, changed: 1, removed: 0 });
		expect(described(after, version({ responses: [] })).summary).toBe('Removed 2 responses.');
	});
});
