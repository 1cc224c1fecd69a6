import { SAFE_STATE_LABELS, type SafeState } from '../schemas/prop-words';
import type { ReadingBand } from './evaluate';

export const CHECK_KINDS = [
	'sensor_test',
	'output_test',
	'safety',
	'retest',
	'maintenance'
] as const;
export type CheckKind = (typeof CHECK_KINDS)[number];

/** How a check is worked: two readings against a band, or a plain pass or fail. */
export type CheckExpected =
	{ mode: 'reading'; band: ReadingBand } | { mode: 'walk'; why: string } | { mode: 'pass_fail' };

export interface GenRoom {
	id: string;
	name: string;
	position: number;
}

export interface GenProp {
	id: string;
	name: string;
	roomId: string | null;
}

export interface GenSensor {
	id: string;
	propId: string;
	name: string;
	kind: string;
	calibration: ReadingBand | null;
}

export interface GenOutput {
	id: string;
	propId: string;
	name: string;
	kind: 'led_string' | 'relay';
	relayKind: string | null;
	safeState: string;
}

export interface GenInput {
	rooms: GenRoom[];
	/** Props used by the night's scenes. */
	props: GenProp[];
	sensors: GenSensor[];
	outputs: GenOutput[];
	/** Rooms (null: no room) of scenes whose flashing needs photosensitivity signage. */
	strobeSceneRooms: (string | null)[];
	/** The venue's own items, in their order. */
	venueItems: { id: string; label: string }[];
	/**
	 * Changes made to props after a signed-off night and not yet covered by another one, oldest
	 * first; each prop with any gets one required re-test line.
	 */
	retests?: { propId: string; changeId: string; line: string }[];
	/**
	 * Outputs whose wear counter has passed its maintenance interval, keyed by what they are due
	 * since (the last maintenance record), so a new due gets a fresh line.
	 */
	maintenance?: { propId: string; outputId: string; since: string; line: string }[];
}

export interface CheckSpec {
	/** Stable across regenerations, so recorded results stay with their check. */
	key: string;
	kind: CheckKind;
	propId: string | null;
	sensorId: string | null;
	outputId: string | null;
	safetyItemId: string | null;
	roomId: string | null;
	label: string;
	detail: string;
	required: boolean;
	expected: CheckExpected;
	sortKey: string;
}

/** Sensor kinds whose reading is a number to compare with a calibrated band. */
export const READING_KINDS = ['capacitive', 'ranging'];

const pad = (n: number) => String(n).padStart(4, '0');

/**
 * The pre-show checklist of one show (design item 8): a sensor test per sensor and an effect test per
 * output of every prop in the night's scenes, the safety items those props call for, the items every
 * night needs, and the venue's own list. Pure: the server stores the result by key.
 */
export function generateChecklist(input: GenInput): CheckSpec[] {
	const roomPos = new Map(input.rooms.map((r) => [r.id, r.position]));
	const roomOrder = (roomId: string | null) => (roomId ? (roomPos.get(roomId) ?? 9000) : 9999);
	const specs: CheckSpec[] = [];
	const base = {
		propId: null,
		sensorId: null,
		outputId: null,
		safetyItemId: null,
		required: true
	};

	// Venue-wide items first: exits and the stop button are walked before any room.
	input.venueItems.forEach((item, i) =>
		specs.push({
			...base,
			key: `venue:${item.id}`,
			kind: 'safety',
			safetyItemId: item.id,
			roomId: null,
			label: item.label,
			detail: "One of the venue's own safety items.",
			expected: { mode: 'pass_fail' },
			sortKey: `0000|0|${pad(i)}`
		})
	);
	specs.push({
		...base,
		key: 'safety:show-stop',
		kind: 'safety',
		roomId: null,
		label: 'Show-stop test: lights come up, audio and effects go off',
		detail:
			'Press the show stop and watch every room go to its safe state; then reset. Life-safety practice for special amusement buildings.',
		expected: { mode: 'pass_fail' },
		sortKey: '0000|1|0000'
	});

	const props = [...input.props].sort(
		(a, b) => roomOrder(a.roomId) - roomOrder(b.roomId) || a.name.localeCompare(b.name)
	);
	const strobeRooms = new Set<string | null>(input.strobeSceneRooms);
	const byProp = <T extends { propId: string }>(rows: T[]) => {
		const m = new Map<string, T[]>();
		for (const r of rows) {
			const list = m.get(r.propId);
			if (list) list.push(r);
			else m.set(r.propId, [r]);
		}
		return m;
	};
	const sensorsOf = byProp(input.sensors);
	const outputsOf = byProp(input.outputs);
	const retestsOf = byProp(input.retests ?? []);
	const maintenanceOf = byProp(input.maintenance ?? []);
	const maintenanceSpec = (
		m: NonNullable<GenInput['maintenance']>[number],
		roomId: string | null,
		sortKey: string
	): CheckSpec => ({
		...base,
		key: `maintenance:${m.outputId}:${m.since}`,
		kind: 'maintenance',
		propId: m.propId,
		outputId: m.outputId,
		roomId,
		label: m.line,
		detail:
			'Its wear counter has passed its maintenance interval: do the maintenance, record it on the output page, then mark this line.',
		expected: { mode: 'pass_fail' },
		sortKey
	});
	props.forEach((prop, p) => {
		const at = (n: number) => `${pad(roomOrder(prop.roomId))}|${pad(p)}|${pad(n)}`;
		let n = 0;
		for (const s of sensorsOf.get(prop.id) ?? []) {
			let expected: CheckExpected;
			let detail: string;
			if (s.calibration) {
				expected = { mode: 'reading', band: s.calibration };
				detail = 'Record one reading with nobody there and one with a hand or body fully in.';
			} else if (READING_KINDS.includes(s.kind)) {
				const why =
					'No calibration has been applied to this sensor yet, so there is no band to read against: walk the trigger range and say whether it fires.';
				expected = { mode: 'walk', why };
				detail = why;
			} else {
				const why =
					'This kind of sensor gives no reading to compare: walk into its range and say whether it fires.';
				expected = { mode: 'walk', why };
				detail = why;
			}
			specs.push({
				...base,
				key: `sensor:${s.id}`,
				kind: 'sensor_test',
				propId: prop.id,
				sensorId: s.id,
				roomId: prop.roomId,
				label: `${prop.name}: ${s.name} sensor test`,
				detail,
				expected,
				sortKey: at(n++)
			});
		}
		const outs = outputsOf.get(prop.id) ?? [];
		for (const o of outs) {
			specs.push({
				...base,
				key: `output:${o.id}`,
				kind: 'output_test',
				propId: prop.id,
				outputId: o.id,
				roomId: prop.roomId,
				label: `${prop.name}: ${o.name} fires and resets`,
				detail: `Fire it by hand, watch it run, and check it returns to its safe state (${(SAFE_STATE_LABELS[o.safeState as SafeState] ?? o.safeState).toLowerCase()}).`,
				expected: { mode: 'pass_fail' },
				sortKey: at(n++)
			});
		}
		const kinds = new Set(outs.map((o) => o.relayKind));
		const item = (key: string, label: string, detail: string) =>
			specs.push({
				...base,
				key: `safety:${key}:${prop.id}`,
				kind: 'safety',
				propId: prop.id,
				roomId: prop.roomId,
				label: `${prop.name}: ${label}`,
				detail,
				expected: { mode: 'pass_fail' },
				sortKey: at(n++)
			});
		if (kinds.has('pneumatic')) {
			item(
				'pinch-guards',
				'pinch points guarded',
				'Every moving part a guest or performer could reach is guarded or out of reach.'
			);
			item(
				'air-bled',
				'air can be bled for maintenance',
				'The dump valve releases stored air, so nobody works on a charged cylinder.'
			);
		}
		if (kinds.has('fog')) {
			item(
				'fog-detectors',
				'detector plan in place for fog',
				'Smoke detectors near the fog are handled as agreed with the authority having jurisdiction (ANSI E1.5, E1.23).'
			);
			item(
				'fog-fluid',
				'fog fluid level checked',
				'Enough fluid for the night, and the right fluid.'
			);
		}
		if (kinds.has('strobe')) strobeRooms.add(prop.roomId);
		const changes = retestsOf.get(prop.id);
		if (changes?.length) {
			// Keyed by the newest change, so a further change asks for a fresh re-test.
			specs.push({
				...base,
				key: `retest:${prop.id}:${changes[changes.length - 1].changeId}`,
				kind: 'retest',
				propId: prop.id,
				roomId: prop.roomId,
				label: `${prop.name}: re-test after changes since its last signed-off night`,
				detail: `Work the prop through its scenes and watch each changed part. Changed: ${changes.map((c) => c.line).join(' ')}`,
				expected: { mode: 'pass_fail' },
				sortKey: at(n++)
			});
		}
		for (const m of maintenanceOf.get(prop.id) ?? [])
			specs.push(maintenanceSpec(m, prop.roomId, at(n++)));
	});
	// Due maintenance on a prop not in tonight's scenes still asks once, with the venue's lines.
	const inNight = new Set(input.props.map((p) => p.id));
	(input.maintenance ?? [])
		.filter((m) => !inNight.has(m.propId))
		.forEach((m, i) => specs.push(maintenanceSpec(m, null, `0000|2|${pad(i)}`)));

	for (const roomId of strobeRooms) {
		const room = input.rooms.find((r) => r.id === roomId);
		specs.push({
			...base,
			key: `safety:strobe-signage:${roomId ?? 'venue'}`,
			kind: 'safety',
			roomId,
			label: `Strobe warning signage posted${room ? ` before ${room.name}` : ''}`,
			detail:
				'Flashing here can trouble people with photosensitive epilepsy: the warning must be posted where guests see it before they enter (WCAG 2.3.1).',
			expected: { mode: 'pass_fail' },
			sortKey: `${pad(roomOrder(roomId))}|9999|0000`
		});
	}
	return specs.sort((a, b) => a.sortKey.localeCompare(b.sortKey));
}

/** The venue's safety items a new venue starts with; show managers edit the list. */
export const DEFAULT_VENUE_ITEMS = [
	'Exits lit and clear',
	'Fire extinguishers in place and in date',
	'First-aid kit stocked',
	'Radio check with every position',
	'Stop buttons tested'
];
