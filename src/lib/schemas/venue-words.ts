// Enum values and their labels for venue settings.
import type { Clock } from '$lib/util/when';

export const VENUE_KINDS = ['haunt', 'trail', 'exhibit'] as const;
export const VENUE_KIND_LABELS: Record<(typeof VENUE_KINDS)[number], string> = {
	haunt: 'Haunted attraction',
	trail: 'Seasonal trail',
	exhibit: 'Interactive exhibit'
};

/** The two ways a venue can write times, each with the way it looks. */
export const CLOCK_LABELS: Record<Clock, { label: string; example: string }> = {
	'24h': { label: '24-hour', example: '19:30' },
	'12h': { label: '12-hour', example: '7:30 pm' }
};
