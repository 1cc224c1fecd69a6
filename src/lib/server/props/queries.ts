import { and, asc, desc, eq, exists, ilike, sql, type SQL } from 'drizzle-orm';
import type { Db } from '$lib/server/db/client';
import { controllers, outputs, props, rooms, sensors } from '$lib/server/db/schema';
import type { PropQuery } from '$lib/schemas/prop';

export const PAGE_SIZE = 50;

/** One page of a venue's props, filtered and sorted in the database. */
export async function listProps(db: Db, venueId: string, q: PropQuery) {
	const where: SQL[] = [eq(props.venueId, venueId)];
	if (q.q) where.push(ilike(props.name, `%${q.q.replace(/[\\%_]/g, (c) => '\\' + c)}%`));
	if (q.room) where.push(eq(props.roomId, q.room));
	if (q.status) where.push(eq(props.status, q.status));
	if (q.sensor)
		where.push(
			exists(
				db
					.select({ one: sql`1` })
					.from(sensors)
					.where(
						and(
							eq(sensors.venueId, venueId),
							eq(sensors.propId, props.id),
							eq(sensors.kind, q.sensor)
						)
					)
			)
		);
	if (q.output)
		where.push(
			exists(
				db
					.select({ one: sql`1` })
					.from(outputs)
					.where(
						and(
							eq(outputs.venueId, venueId),
							eq(outputs.propId, props.id),
							eq(outputs.kind, q.output)
						)
					)
			)
		);
	const by = {
		name: props.name,
		room: rooms.name,
		status: props.status,
		updated: props.updatedAt
	}[q.sort];
	const order = q.dir === 'desc' ? desc : asc;
	const filter = and(...where);
	const rows = await db
		.select({
			id: props.id,
			name: props.name,
			status: props.status,
			updatedAt: props.updatedAt,
			roomName: rooms.name,
			controllerName: controllers.name,
			sensorCount: sql<number>`(select count(*)::int from ${sensors} where ${sensors.propId} = ${props.id} and ${sensors.venueId} = ${venueId})`,
			outputCount: sql<number>`(select count(*)::int from ${outputs} where ${outputs.propId} = ${props.id} and ${outputs.venueId} = ${venueId})`
		})
		.from(props)
		.leftJoin(rooms, and(eq(rooms.id, props.roomId), eq(rooms.venueId, venueId)))
		.leftJoin(
			controllers,
			and(eq(controllers.id, props.controllerId), eq(controllers.venueId, venueId))
		)
		.where(filter)
		.orderBy(order(by), asc(props.id))
		.limit(PAGE_SIZE)
		.offset((q.page - 1) * PAGE_SIZE);
	const [{ total }] = await db
		.select({ total: sql<number>`count(*)::int` })
		.from(props)
		.where(filter);
	return { rows, total, pages: Math.max(1, Math.ceil(total / PAGE_SIZE)) };
}

export async function venueRooms(db: Db, venueId: string) {
	return db
		.select({ id: rooms.id, name: rooms.name })
		.from(rooms)
		.where(eq(rooms.venueId, venueId))
		.orderBy(asc(rooms.position), asc(rooms.name));
}

export async function venueControllers(db: Db, venueId: string) {
	return db
		.select()
		.from(controllers)
		.where(eq(controllers.venueId, venueId))
		.orderBy(asc(controllers.name));
}

/** Checks that a room and controller chosen in a form belong to this venue. */
export async function ownsRefs(
	db: Db,
	venueId: string,
	refs: { roomId: string | null; controllerId: string | null }
) {
	const errors: Record<string, string[]> = {};
	if (refs.roomId) {
		const [r] = await db
			.select({ id: rooms.id })
			.from(rooms)
			.where(and(eq(rooms.id, refs.roomId), eq(rooms.venueId, venueId)));
		if (!r) errors.roomId = ['Choose a room from the list.'];
	}
	if (refs.controllerId) {
		const [c] = await db
			.select({ id: controllers.id })
			.from(controllers)
			.where(and(eq(controllers.id, refs.controllerId), eq(controllers.venueId, venueId)));
		if (!c) errors.controllerId = ['Choose a controller from the list.'];
	}
	return errors;
}

export async function getProp(db: Db, venueId: string, propId: string) {
	if (!/^[0-9a-f-]{36}$/i.test(propId)) return null;
	const [row] = await db
		.select()
		.from(props)
		.where(and(eq(props.id, propId), eq(props.venueId, venueId)));
	return row ?? null;
}

export async function getController(db: Db, venueId: string, id: string | null) {
	if (!id) return null;
	const [row] = await db
		.select()
		.from(controllers)
		.where(and(eq(controllers.id, id), eq(controllers.venueId, venueId)));
	return row ?? null;
}

export const isUuid = (s: string) =>
	/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(s);
