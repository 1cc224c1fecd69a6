// One person's run sheet for one night: the data the page and the e-mail both show, and its words.

export type RunSheetWarning =
	| { kind: 'strobe' | 'fog' | 'pneumatics' | 'mains'; note?: string }
	| { kind: 'stood_down'; prop: string; reason: string };

export interface RunSheetScene {
	name: string;
	room: string;
	/** One line per cue, already summarised ("0:04 pulse the drop valve 0.3 s"). */
	cues: string[];
	warnings: RunSheetWarning[];
}

export interface RunSheetData {
	venueName: string;
	address: string | null;
	/** Local date and times, already formatted in the venue's time zone. */
	dateLabel: string;
	crewCall: string;
	doors: string;
	timeZone: string;
	person: { name: string };
	position: string;
	rooms: string[];
	scenes: RunSheetScene[];
	/** Their lines of the night's checklist: their rooms' checks, and every safety check for a safety post. */
	checklist?: { room: string | null; item: string }[];
	/** Open faults on props in their rooms (every room for a safety post). */
	faults?: { room: string | null; prop: string; severity: string; seen: string }[];
	/** A safety post: it covers every room. */
	safetyPost?: boolean;
	/** For a safety post: every room's hazards, scene by scene. */
	hazards?: { room: string; scene: string; warnings: RunSheetWarning[] }[];
	/** A phone number, an e-mail address or both. */
	safetyContacts: {
		name: string;
		role: string | null;
		phone?: string | null;
		email?: string | null;
	}[];
	showStop: string[];
	/** The web version of this run sheet. */
	url?: string;
	/** Set on a run sheet sent again because something changed: what changed since the last one. */
	changes?: { what: string; before: string; after: string }[];
}

const WARNING_WORDS = {
	strobe: 'Strobe: photosensitivity signage must be up',
	fog: 'Fog: check detectors and ventilation',
	pneumatics: 'Pneumatics: keep clear of moving parts',
	mains: 'Mains-powered load: enclosures stay shut, wiring is for a licensed electrician'
} as const;

export function warningText(w: RunSheetWarning): string {
	if (w.kind === 'stood_down')
		return `Stood down tonight: ${w.prop}, held in safe state (${w.reason})`;
	return w.note ? `${WARNING_WORDS[w.kind]} (${w.note})` : WARNING_WORDS[w.kind];
}

export function runSheetSubject(d: Pick<RunSheetData, 'venueName' | 'dateLabel' | 'changes'>) {
	const base = `Run sheet for ${d.dateLabel} at ${d.venueName}`;
	return d.changes?.length ? `Changed: ${base}` : base;
}

/** The rooms line: a safety post covers every room; a post without a room says so plainly. */
export function roomsText(d: Pick<RunSheetData, 'rooms' | 'safetyPost'>) {
	if (d.safetyPost) return d.rooms.length ? `Every room (${d.rooms.join(', ')})` : 'Every room';
	return d.rooms.join(', ') || 'No room of your own';
}
