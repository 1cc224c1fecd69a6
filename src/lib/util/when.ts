/** Wall-clock words for an instant in the venue's time zone. */
export function localTime(at: Date | string, timeZone: string): string {
	return new Intl.DateTimeFormat('en-GB', {
		timeZone,
		hour: '2-digit',
		minute: '2-digit',
		hourCycle: 'h23'
	}).format(new Date(at));
}

/** 'Fri 1 Oct 2027' for a local 'YYYY-MM-DD' date. */
export function localDay(date: string): string {
	return new Intl.DateTimeFormat('en-GB', {
		timeZone: 'UTC',
		weekday: 'short',
		day: 'numeric',
		month: 'short',
		year: 'numeric'
	})
		.format(new Date(`${date}T00:00:00Z`))
		.replace(',', '');
}

/** The venue's local date 'YYYY-MM-DD' of an instant. */
export function localDate(at: Date, timeZone: string): string {
	return new Intl.DateTimeFormat('en-CA', {
		timeZone,
		year: 'numeric',
		month: '2-digit',
		day: '2-digit'
	}).format(at);
}

/** The place a time zone is named after, for sentences: 'America/New_York' → 'New York'. */
export function zonePlace(timeZone: string): string {
	const place = timeZone.split('/').pop() ?? timeZone;
	return place.replace(/_/g, ' ');
}
