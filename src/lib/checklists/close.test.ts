import { describe, expect, it } from 'vitest';
import { generateCloseChecklist } from './close';

const rooms = [
	{ id: 'r1', name: 'Crypt', position: 1 },
	{ id: 'r2', name: 'Yard', position: 2 }
];

describe('generateCloseChecklist', () => {
	it('asks per fog output, once per pneumatic prop, per strobe, and nothing for LEDs, audio or solenoids', () => {
		const specs = generateCloseChecklist({
			rooms,
			props: [
				{ id: 'p1', name: 'Coffin', roomId: 'r1' },
				{ id: 'p2', name: 'Gate', roomId: 'r2' }
			],
			outputs: [
				{ id: 'o1', propId: 'p1', name: 'Lid ram', relayKind: 'pneumatic' },
				{ id: 'o2', propId: 'p1', name: 'Lid kicker', relayKind: 'pneumatic' },
				{ id: 'o3', propId: 'p1', name: 'Low fog', relayKind: 'fog' },
				{ id: 'o4', propId: 'p2', name: 'Lightning', relayKind: 'strobe' },
				{ id: 'o5', propId: 'p2', name: 'Creak', relayKind: 'audio' },
				{ id: 'o6', propId: 'p2', name: 'Latch', relayKind: 'solenoid' },
				{ id: 'o7', propId: 'p2', name: 'Lamp', relayKind: null }
			],
			maintenance: [{ outputId: 'o1', propId: 'p1', since: 'start', line: 'Coffin: Lid ram due' }]
		});
		expect(specs.map((s) => s.key)).toEqual([
			'fog:o3',
			'air:p1',
			'maintenance:o1:start',
			'strobe:o4',
			'venue:incidents',
			'venue:guests',
			'venue:doors'
		]);
		expect(specs.every((s) => s.required)).toBe(true);
	});
});
