// Enum values and their labels for incidents and show stops (words from the glossary).
export const INCIDENT_KINDS = [
	'guest_injury',
	'crew_injury',
	'guest_struck_crew',
	'evacuation',
	'false_alarm',
	'near_miss',
	'show_stop'
] as const;
export type IncidentKind = (typeof INCIDENT_KINDS)[number];
export const INCIDENT_KIND_LABELS: Record<IncidentKind, string> = {
	guest_injury: 'Guest injury',
	crew_injury: 'Crew injury',
	guest_struck_crew: 'Guest struck crew',
	evacuation: 'Evacuation',
	false_alarm: 'False alarm',
	near_miss: 'Near miss',
	show_stop: 'Show stop'
};
/** The kind inside a sentence: "reported a guest injury". */
export const INCIDENT_KIND_PHRASES: Record<IncidentKind, string> = {
	guest_injury: 'a guest injury',
	crew_injury: 'a crew injury',
	guest_struck_crew: 'a guest striking crew',
	evacuation: 'an evacuation',
	false_alarm: 'a false alarm',
	near_miss: 'a near miss',
	show_stop: 'a show stop'
};

/** What can happen to an incident after it is reported: a follow-up note, or the closing note. */
export const INCIDENT_EVENT_KINDS = ['follow_up', 'closed'] as const;
export type IncidentEventKind = (typeof INCIDENT_EVENT_KINDS)[number];
export const INCIDENT_EVENT_LABELS: Record<IncidentEventKind, string> = {
	follow_up: 'Follow-up',
	closed: 'Closed'
};
