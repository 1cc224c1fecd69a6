import {
	bigint,
	doublePrecision,
	index,
	integer,
	jsonb,
	pgEnum,
	pgTable,
	text,
	timestamp,
	uuid
} from 'drizzle-orm/pg-core';
import { users } from './auth.schema';
import { rooms } from './venues.schema';
import {
	OUTPUT_KINDS,
	PROP_STATUSES,
	RELAY_KINDS,
	SAFE_STATES,
	SENSOR_KINDS
} from '../../schemas/prop-words';
import type { SensorSettings } from '../../schemas/sensor';
import type { OutputSettings } from '../../schemas/output';
import type { BrightnessCurve } from '../../curves/curve';
import { createdAt, venueId } from './columns';

/** What applying a capture's calibration stores on the sensor. */
export interface SensorCalibration {
	direction: 'up' | 'down';
	/** Reading that counts as someone arriving. */
	enter: number;
	/** Reading that counts as them gone (enter minus hysteresis). */
	exit: number;
	/** Idle readings are expected inside this band. */
	baselineLow: number;
	baselineHigh: number;
	captureId: string | null;
	appliedAt: string;
}

export const propStatus = pgEnum('prop_status', PROP_STATUSES);
export const sensorKind = pgEnum('sensor_kind', SENSOR_KINDS);
export const outputKind = pgEnum('output_kind', OUTPUT_KINDS);
export const relayKind = pgEnum('relay_kind', RELAY_KINDS);
export const safeState = pgEnum('safe_state', SAFE_STATES);
export const propFileKind = pgEnum('prop_file_kind', ['photo', 'wiring']);

export const controllers = pgTable(
	'controllers',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		venueId: venueId(),
		name: text('name').notNull(),
		supplyV: doublePrecision('supply_v').notNull(),
		clockHz: doublePrecision('clock_hz').notNull(),
		timerBits: integer('timer_bits').notNull(),
		pwmBits: integer('pwm_bits').notNull(),
		prescaler: integer('prescaler').notNull().default(1),
		referenceV: doublePrecision('reference_v').notNull(),
		pinLimitMa: doublePrecision('pin_limit_ma').notNull(),
		supplyRatingA: doublePrecision('supply_rating_a').notNull(),
		/** Firmware time recharging a capacitive plate before each reading, µs. */
		rechargeUs: doublePrecision('recharge_us').notNull().default(0),
		/** The rest of the board's loop, once per update, ms. */
		loopOverheadMs: doublePrecision('loop_overhead_ms').notNull().default(0),
		createdAt: createdAt()
	},
	(t) => [index('controllers_venue').on(t.venueId, t.name)]
);

export const props = pgTable(
	'props',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		venueId: venueId(),
		name: text('name').notNull(),
		roomId: uuid('room_id').references(() => rooms.id, { onDelete: 'set null' }),
		controllerId: uuid('controller_id').references(() => controllers.id, {
			onDelete: 'set null'
		}),
		status: propStatus('status').notNull().default('design'),
		notes: text('notes'),
		createdAt: createdAt(),
		updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [
		// The props table sorts and filters within one venue; these keep it quick at thousands of rows.
		index('props_venue_name').on(t.venueId, t.name),
		index('props_venue_status').on(t.venueId, t.status),
		index('props_venue_room').on(t.venueId, t.roomId),
		index('props_venue_updated').on(t.venueId, t.updatedAt)
	]
);

export const sensors = pgTable(
	'sensors',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		venueId: venueId(),
		propId: uuid('prop_id')
			.notNull()
			.references(() => props.id, { onDelete: 'cascade' }),
		kind: sensorKind('kind').notNull(),
		name: text('name').notNull(),
		settings: jsonb('settings').$type<SensorSettings>().notNull(),
		near: doublePrecision('near'),
		far: doublePrecision('far'),
		hysteresis: doublePrecision('hysteresis'),
		debounceMs: integer('debounce_ms').notNull().default(0),
		rearmMs: integer('rearm_ms').notNull().default(0),
		/** Thresholds from the capture last applied; the pre-show sensor test reads against these. */
		calibration: jsonb('calibration').$type<SensorCalibration>(),
		createdAt: createdAt()
	},
	(t) => [
		index('sensors_prop').on(t.venueId, t.propId),
		index('sensors_kind').on(t.venueId, t.kind)
	]
);

export const outputs = pgTable(
	'outputs',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		venueId: venueId(),
		propId: uuid('prop_id')
			.notNull()
			.references(() => props.id, { onDelete: 'cascade' }),
		kind: outputKind('kind').notNull(),
		relayKind: relayKind('relay_kind'),
		name: text('name').notNull(),
		settings: jsonb('settings').$type<OutputSettings>().notNull(),
		safeState: safeState('safe_state').notNull(),
		curve: jsonb('curve').$type<BrightnessCurve>(),
		createdAt: createdAt()
	},
	(t) => [
		index('outputs_prop').on(t.venueId, t.propId),
		index('outputs_kind').on(t.venueId, t.kind)
	]
);

export const captures = pgTable(
	'captures',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		venueId: venueId(),
		sensorId: uuid('sensor_id')
			.notNull()
			.references(() => sensors.id, { onDelete: 'cascade' }),
		objectKey: text('object_key').notNull(),
		filename: text('filename').notNull(),
		sizeBytes: bigint('size_bytes', { mode: 'number' }).notNull(),
		sha256: text('sha256').notNull(),
		rows: integer('rows').notNull(),
		idleRows: integer('idle_rows').notNull(),
		presentRows: integer('present_rows').notNull(),
		summary: jsonb('summary').$type<Record<string, unknown>>().notNull(),
		uploadedBy: text('uploaded_by').references(() => users.id, { onDelete: 'set null' }),
		uploadedAt: timestamp('uploaded_at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [index('captures_sensor').on(t.venueId, t.sensorId, t.uploadedAt)]
);

export const propFiles = pgTable(
	'prop_files',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		venueId: venueId(),
		propId: uuid('prop_id')
			.notNull()
			.references(() => props.id, { onDelete: 'cascade' }),
		kind: propFileKind('kind').notNull(),
		objectKey: text('object_key').notNull(),
		filename: text('filename').notNull(),
		contentType: text('content_type').notNull(),
		sizeBytes: bigint('size_bytes', { mode: 'number' }).notNull(),
		sha256: text('sha256').notNull(),
		uploadedBy: text('uploaded_by').references(() => users.id, { onDelete: 'set null' }),
		uploadedAt: timestamp('uploaded_at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [index('prop_files_prop').on(t.venueId, t.propId)]
);
