import { timestamp, uuid } from 'drizzle-orm/pg-core';
import { venues } from './venues.schema';

// Columns most venue-owned tables share. Not re-exported by schema.ts: they are builders, not tables.

/** The owning venue; its rows go when the venue does. */
export const venueId = () =>
	uuid('venue_id')
		.notNull()
		.references(() => venues.id, { onDelete: 'cascade' });

export const createdAt = () =>
	timestamp('created_at', { withTimezone: true }).notNull().defaultNow();
