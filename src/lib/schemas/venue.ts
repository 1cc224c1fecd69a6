import { z } from 'zod';
import { isTimeZone } from '$lib/schedule/wall-time';
import { CLOCKS } from '$lib/util/when';

import { VENUE_KINDS, VENUE_KIND_LABELS } from './venue-words';
// The words live apart from zod, so pages that only show them do not ship the validation library.
export { VENUE_KINDS, VENUE_KIND_LABELS };

/** A known IANA zone named by region (Europe/London), or UTC; bare abbreviations are refused. */
export function isVenueTimeZone(tz: string): boolean {
	return isTimeZone(tz) && (tz.includes('/') || tz === 'UTC');
}

export const timeZoneField = z
	.string({ error: 'Choose a time zone.' })
	.trim()
	.refine(isVenueTimeZone, 'Use an IANA time zone such as Europe/London or America/Chicago.');

const optionalText = (max: number) =>
	z
		.string()
		.trim()
		.max(max, `Use at most ${max} characters.`)
		.optional()
		.transform((v) => (v ? v : null));

export const newVenueSchema = z.object({
	name: z
		.string({ error: 'Name the venue.' })
		.trim()
		.min(2, 'Use at least 2 characters.')
		.max(80, 'Use at most 80 characters.'),
	kind: z.enum(VENUE_KINDS, { error: 'Choose what kind of venue this is.' }),
	timeZone: timeZoneField
});

export const venueSettingsSchema = newVenueSchema.extend({
	clock: z.enum(CLOCKS, { error: 'Choose how times are written: 24-hour or 12-hour.' }),
	address: optionalText(200),
	defaultGroupSize: z.coerce
		.number({ error: 'Enter a whole number of guests.' })
		.int('Enter a whole number of guests.')
		.min(1, 'A group has at least 1 guest.')
		.max(100, 'Groups over 100 are not supported.'),
	dispatchIntervalSeconds: z.coerce
		.number({ error: 'Enter seconds between groups.' })
		.int('Enter whole seconds.')
		.min(5, 'Use at least 5 seconds.')
		.max(3600, 'Use at most an hour.'),
	safetyContactName: optionalText(100),
	safetyContactPhone: optionalText(40),
	runSheetLeadHours: z.coerce
		.number({ error: 'Enter a whole number of hours.' })
		.int('Enter a whole number of hours.')
		.min(0, 'Use 0 or more hours (0 turns automatic sending off).')
		.max(336, 'Use at most 336 hours (two weeks).')
});
