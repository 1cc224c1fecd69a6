import { and, eq } from 'drizzle-orm';
import type { Db } from './db/client';
import { controllers, outputs, props, rooms, sensors } from './db/schema';
import type { SensorSettings } from '../schemas/sensor';
import type { OutputSettings } from '../schemas/output';
import type { PropStatus, SafeState } from '../schemas/prop-words';
import type { BrightnessCurve } from '../curves/curve';

// Invented props for the demo venues. Matched by name, so loading twice changes nothing.
type DemoProp = {
	name: string;
	room: string;
	status: PropStatus;
	notes: string;
	sensors: { name: string; settings: SensorSettings; debounceMs: number; rearmMs: number }[];
	outputs: {
		name: string;
		settings: OutputSettings;
		safeState: SafeState;
		curve?: BrightnessCurve;
	}[];
};

const BOARD = {
	name: 'Lantern board A',
	supplyV: 5,
	clockHz: 16_000_000,
	timerBits: 16,
	pwmBits: 8,
	prescaler: 64,
	referenceV: 1.1,
	pinLimitMa: 20,
	supplyRatingA: 3
};

const warmString: OutputSettings = {
	kind: 'led_string',
	colour: 'white',
	forwardV: 3.2,
	ledsInSeries: 3,
	strings: 4,
	currentMa: 20,
	supplyV: 12,
	switchDropV: 0.1,
	logicHighV: 5,
	gateThresholdMaxV: 2.5,
	continuousDrainMa: 200
};

const relay = (
	relayKind: 'pneumatic' | 'fog',
	loadV: number,
	loadCurrentA: number
): OutputSettings => ({
	kind: 'relay',
	relayKind,
	coilV: 5,
	coilOhm: 70,
	loadSupply: 'dc',
	loadV,
	loadCurrentA,
	contactRatingA: 10,
	contactRatingV: 30,
	onMs: relayKind === 'pneumatic' ? 250 : 3000,
	minOnMs: relayKind === 'pneumatic' ? 50 : 500,
	offMs: relayKind === 'pneumatic' ? 1500 : 20000,
	minOffMs: relayKind === 'pneumatic' ? 200 : 5000,
	maxDutyPercent: relayKind === 'fog' ? 25 : null
});

export const DEMO_PROPS: Record<string, DemoProp[]> = {
	'hollow-pines-trail': [
		{
			name: 'Hand in the well',
			room: 'Lantern Walk',
			status: 'show_ready',
			notes: 'A copper plate under the well lip; the lanterns below swell as a hand reaches in.',
			sensors: [
				{
					name: 'Well-lip plate',
					settings: {
						kind: 'capacitive',
						resistanceOhm: 1_000_000,
						plateAreaCm2: 150,
						gapMm: 15,
						strayPf: 12,
						samplesAveraged: 8,
						readingNoiseCounts: 2,
						handFraction: 0.5
					},
					debounceMs: 40,
					rearmMs: 1500
				}
			],
			outputs: [
				{ name: 'Warm lanterns', settings: warmString, safeState: 'full', curve: { kind: 'cie' } }
			]
		},
		{
			name: 'Barn-loft drop',
			room: 'Hollow Barn',
			status: 'installed',
			notes: 'A sack drops from the loft when guests cross the threshold beam.',
			sensors: [
				{
					name: 'Threshold beam',
					settings: { kind: 'break_beam', beamLengthM: 1.8 },
					debounceMs: 20,
					rearmMs: 8000
				}
			],
			outputs: [
				{ name: 'Drop valve', settings: relay('pneumatic', 12, 0.4), safeState: 'de_energised' }
			]
		},
		{
			name: 'Orchard mist',
			room: 'Bone Orchard',
			status: 'bench',
			notes: 'Low mist between the trees, timed with the owl call.',
			sensors: [
				{
					name: 'Path watcher',
					settings: { kind: 'motion', warmUpS: 60, rangeM: 7 },
					debounceMs: 100,
					rearmMs: 30000
				}
			],
			outputs: [{ name: 'Fog machine', settings: relay('fog', 24, 2), safeState: 'off' }]
		}
	],
	'marrowfield-night-gallery': [
		{
			name: 'Whispering bell jar',
			room: 'Echo Tunnel',
			status: 'design',
			notes: 'A bell jar that glows as a visitor leans closer.',
			sensors: [
				{
					name: 'Lean sensor',
					settings: { kind: 'ranging', method: 'time_of_flight', airTempC: 19, maxRangeM: 1.2 },
					debounceMs: 30,
					rearmMs: 500
				}
			],
			outputs: [
				{
					name: 'Jar glow',
					settings: { ...warmString, colour: 'amber', forwardV: 2.1, strings: 1 },
					safeState: 'full',
					curve: { kind: 'gamma', exponent: 2.2 }
				}
			]
		}
	]
};

export async function seedDemoProps(db: Db, venueId: string, slug: string) {
	const list = DEMO_PROPS[slug];
	if (!list) return;
	let [board] = await db
		.select()
		.from(controllers)
		.where(and(eq(controllers.venueId, venueId), eq(controllers.name, BOARD.name)));
	if (!board)
		[board] = await db
			.insert(controllers)
			.values({ ...BOARD, venueId })
			.returning();
	const roomRows = await db.select().from(rooms).where(eq(rooms.venueId, venueId));
	for (const p of list) {
		const [existing] = await db
			.select({ id: props.id })
			.from(props)
			.where(and(eq(props.venueId, venueId), eq(props.name, p.name)));
		if (existing) continue;
		const [prop] = await db
			.insert(props)
			.values({
				venueId,
				name: p.name,
				roomId: roomRows.find((r) => r.name === p.room)?.id ?? null,
				controllerId: board.id,
				status: p.status,
				notes: p.notes
			})
			.returning();
		for (const s of p.sensors)
			await db.insert(sensors).values({
				venueId,
				propId: prop.id,
				kind: s.settings.kind,
				name: s.name,
				settings: s.settings,
				debounceMs: s.debounceMs,
				rearmMs: s.rearmMs
			});
		for (const o of p.outputs)
			await db.insert(outputs).values({
				venueId,
				propId: prop.id,
				kind: o.settings.kind,
				relayKind: o.settings.kind === 'relay' ? o.settings.relayKind : null,
				name: o.name,
				settings: o.settings,
				safeState: o.safeState,
				curve: o.curve ?? null
			});
	}
}
