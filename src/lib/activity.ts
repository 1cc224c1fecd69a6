// One line of a venue's Activity in a sentence: who did what to which thing, with links where the
// thing still exists. Audit details are whatever each action stored at the time, so every field is
// read defensively and an unknown action still reads as plain words, never as a raw key or id.
import { ROLE_LABELS, type Role } from './roles';
import { INCIDENT_KIND_PHRASES, type IncidentKind } from './schemas/incident-words';
import { clockTime, localDay, type Clock } from './util/when';

/** A piece of a sentence: plain words, or words that link somewhere. */
export type Part = string | { text: string; href: string };

/** Names and links for ids that audit details refer to, looked up by the server. */
export interface ActivityRefs {
	/** The venue's base path, e.g. '/v/the-lantern-walk'. */
	base: string;
	people: Map<string, string>;
	/** Show id → its local date ('YYYY-MM-DD'). */
	shows: Map<string, string>;
	scenes: Map<string, string>;
	props: Map<string, string>;
	/** How the venue writes times. */
	clock: Clock;
}

type Detail = Record<string, unknown>;

const str = (v: unknown): string | null => (typeof v === 'string' && v.trim() ? v : null);
const num = (v: unknown): number | null => (typeof v === 'number' && Number.isFinite(v) ? v : null);
const list = (v: unknown): string[] =>
	Array.isArray(v) ? v.filter((x): x is string => typeof x === 'string') : [];
const quoted = (v: unknown, fallback: string) => (str(v) ? `“${str(v)}”` : fallback);
const role = (v: unknown) =>
	typeof v === 'string' && v in ROLE_LABELS ? ROLE_LABELS[v as Role].toLowerCase() : 'a member';
const isDate = (v: unknown): v is string => typeof v === 'string' && /^\d{4}-\d{2}-\d{2}$/.test(v);
const plural = (n: number, one: string, many = `${one}s`) =>
	`${n.toLocaleString('en-GB')} ${n === 1 ? one : many}`;

/** Ids look like UUIDs; a value that is one is never shown as words. */
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

function showRef(d: Detail, refs: ActivityRefs): Part {
	const id = str(d.show);
	const date = isDate(d.date) ? d.date : id ? refs.shows.get(id) : undefined;
	const text = date ? `the show on ${localDay(date)}` : 'a show';
	return id && refs.shows.has(id) ? { text, href: `${refs.base}/shows/${id}` } : text;
}

/** The night's incidents page, named by the night: "the show on Fri 1 Oct 2027". */
function incidentsRef(d: Detail, refs: ActivityRefs): Part {
	const id = str(d.show);
	const date = isDate(d.date) ? d.date : id ? refs.shows.get(id) : undefined;
	const text = date ? `the show on ${localDay(date)}` : 'a show';
	return id && refs.shows.has(id) ? { text, href: `${refs.base}/shows/${id}/incidents` } : text;
}

const incidentKind = (v: unknown) =>
	typeof v === 'string' && v in INCIDENT_KIND_PHRASES
		? INCIDENT_KIND_PHRASES[v as IncidentKind]
		: 'an incident';

function personRef(v: unknown, refs: ActivityRefs, fallback = 'someone'): Part {
	const id = str(v);
	if (!id) return fallback;
	return refs.people.get(id) ?? (UUID.test(id) ? 'a former member' : id);
}

function sceneRef(v: unknown, refs: ActivityRefs): Part {
	const id = str(v);
	if (!id) return 'a scene';
	if (!UUID.test(id)) return `“${id}”`;
	const name = refs.scenes.get(id);
	return name ? { text: `“${name}”`, href: `${refs.base}/scenes/${id}` } : 'a scene since removed';
}

const SIMPLE: Record<string, (d: Detail) => string> = {
	'venue.created': (d) => `created the venue ${quoted(d.name, '')}`.trim(),
	'room.added': (d) => `added the room ${quoted(d.name, '')}`.trim(),
	'room.changed': (d) => `renamed a room to ${quoted(d.name, 'a new name')}`,
	'room.removed': (d) => `removed the room ${quoted(d.name, '')}`.trim(),
	'position.added': (d) => `added the position ${quoted(d.name, '')}`.trim(),
	'position.changed': (d) =>
		d.was
			? `renamed the position ${quoted(d.was, '')} to ${quoted(d.name, 'a new name')}`
			: `changed the position ${quoted(d.name, '')}`.trim(),
	'position.removed': (d) => `removed the position ${quoted(d.name, '')}`.trim(),
	'controller.added': (d) => `added the controller ${quoted(d.name, '')}`.trim(),
	'controller.changed': (d) => `changed the controller ${quoted(d.name, '')}`.trim(),
	'controller.removed': (d) => {
		const n = num(d.propsSetToNone) ?? 0;
		return `removed the controller ${quoted(d.name, '')}${n ? ` and left ${plural(n, 'prop')} without one` : ''}`;
	},
	'prop.added': (d) => `added the prop ${quoted(d.name, '')}`.trim(),
	'prop.changed': (d) => `changed the prop ${quoted(d.name, '')}`.trim(),
	'prop.removed': (d) => `removed the prop ${quoted(d.name, '')}`.trim(),
	'capture.uploaded': (d) => {
		const rows = num(d.rows);
		return `uploaded the capture ${quoted(d.file, '')}${rows !== null ? ` (${plural(rows, 'reading')})` : ''} for the sensor ${quoted(d.sensor, '')}`;
	},
	'capture.removed': (d) => `removed a capture of the sensor ${quoted(d.sensor, '')}`,
	'sensor.calibrated': (d) =>
		`set the trigger range of the sensor ${quoted(d.sensor, '')} from the capture ${quoted(d.capture, '')}`,
	'scene.created': (d) => `made the scene ${quoted(d.name, '')}`.trim(),
	'scene.changed': (d) =>
		`changed the scene ${quoted(d.name, '')}${str(d.summary) ? `: ${str(d.summary)}` : ''}`,
	'scene.removed': (d) => `removed the scene ${quoted(d.name, '')}`.trim(),
	'season.added': (d) => {
		const n = num(d.shows);
		return `added the season ${quoted(d.name, '')}${n !== null ? ` with ${plural(n, 'show')}` : ''}`;
	},
	'season.changed': (d) => {
		const bits = [
			num(d.added) ? `${plural(num(d.added)!, 'show')} added` : '',
			num(d.updated) ? `${plural(num(d.updated)!, 'show')} moved` : '',
			num(d.removed) ? `${plural(num(d.removed)!, 'show')} removed` : ''
		].filter(Boolean);
		return `changed the season ${quoted(d.name, '')}${bits.length ? ` (${bits.join(', ')})` : ''}`;
	},
	'season.removed': (d) => `removed the season ${quoted(d.name, '')}`.trim(),
	'safety_item.added': (d) => `added ${quoted(d.label, 'an item')} to the safety walk`,
	'safety_item.retired': (d) => `took ${quoted(d.label, 'an item')} off the safety walk`,
	'safety_item.restored': (d) => `put ${quoted(d.label, 'an item')} back on the safety walk`,
	'venue.settings_changed': () => 'changed the venue settings',
	'invitation.sent': (d) => `invited ${str(d.email) ?? 'someone'} to join as ${role(d.role)}`,
	'invitation.revoked': (d) => `withdrew the invitation to ${str(d.email) ?? 'someone'}`,
	'invitation.accepted': (d) => `joined the venue as ${role(d.role)}`,
	'mail.resent': (d) =>
		`sent ${quoted(d.subject, 'an e-mail')} to ${str(d.to) ?? 'its recipient'} again`,
	'show.moved': (d) =>
		isDate(d.from) && isDate(d.to)
			? `moved a show from ${localDay(d.from)} to ${localDay(d.to)}`
			: 'moved a show'
};

const STATUS_WORDS: Record<string, string> = {
	scheduled: 'back on',
	cancelled: 'cancelled',
	dark: 'dark'
};

/** The sentence after the person's name. */
export function activitySentence(action: string, detail: unknown, refs: ActivityRefs): Part[] {
	const d: Detail = detail && typeof detail === 'object' ? (detail as Detail) : {};
	const simple = SIMPLE[action];
	if (simple) return [simple(d)];
	switch (action) {
		case 'member.role_changed':
			return [
				'changed ',
				personRef(d.personId, refs, 'a member'),
				`’s role from ${role(d.from)} to ${role(d.to)}`
			];
		case 'member.removed':
			return [
				'removed ',
				personRef(d.personId, refs, 'a member'),
				` (${role(d.role)}) from the venue`
			];
		case 'prop.file_uploaded': {
			const id = str(d.propId);
			const name = id ? refs.props.get(id) : undefined;
			return [
				`uploaded the file ${quoted(d.file, '')} to `,
				id && name ? { text: `“${name}”`, href: `${refs.base}/props/${id}` } : 'a prop'
			];
		}
		case 'show.added':
			return ['added ', showRef(d, refs)];
		case 'show.changed': {
			const times = [
				str(d.doorsOpen) && str(d.doorsClose)
					? `doors ${clockTime(str(d.doorsOpen)!, refs.clock)}–${clockTime(str(d.doorsClose)!, refs.clock)}`
					: '',
				str(d.crewCall) ? `crew call ${clockTime(str(d.crewCall)!, refs.clock)}` : ''
			].filter(Boolean);
			return [
				'changed the times of ',
				showRef(d, refs),
				times.length ? `: ${times.join(', ')}` : ''
			];
		}
		case 'show.status': {
			const s = str(d.status);
			return ['marked ', showRef(d, refs), ` ${(s && STATUS_WORDS[s]) ?? 'changed'}`];
		}
		case 'show.assigned':
			return [
				'put ',
				personRef(d.person, refs),
				` on ${quoted(d.position, 'a position')} for `,
				showRef(d, refs)
			];
		case 'show.unassigned':
			return str(d.person)
				? [
						'took ',
						personRef(d.person, refs),
						` off ${quoted(d.position, 'a position')} for `,
						showRef(d, refs)
					]
				: ['took someone off a show'];
		case 'show.scene_left_out':
			return ['left ', sceneRef(d.scene, refs), ' out of ', showRef(d, refs)];
		case 'show.scene_put_back':
			return ['put ', sceneRef(d.scene, refs), ' back into ', showRef(d, refs)];
		case 'show.prop_stood_down':
			return [
				`stood down ${quoted(d.prop, 'a prop')} for `,
				showRef(d, refs),
				str(d.reason) ? `: ${str(d.reason)}` : ''
			];
		case 'show.signed_off': {
			const checks = num(d.checks);
			const down = list(d.stoodDown);
			const bits = [
				checks !== null ? plural(checks, 'check') : '',
				down.length ? `stood down: ${down.join(', ')}` : '',
				list(d.acknowledged).length
					? `${plural(list(d.acknowledged).length, 'crew problem')} acknowledged`
					: ''
			].filter(Boolean);
			return ['signed off ', showRef(d, refs), bits.length ? ` (${bits.join('; ')})` : ''];
		}
		case 'run_sheets.sent': {
			const queued = num(d.queued) ?? 0;
			const unchanged = num(d.unchanged) ?? 0;
			return [
				`sent ${plural(queued, 'run sheet')} for `,
				showRef(d, refs),
				unchanged ? ` (${plural(unchanged, 'sheet')} unchanged, not sent again)` : ''
			];
		}
		case 'incident.reported': {
			const stopped = num(d.stoppedMinutes);
			return [
				`reported ${incidentKind(d.kind)} on `,
				incidentsRef(d, refs),
				stopped ? ` (the show stopped for ${plural(stopped, 'minute')})` : ''
			];
		}
		case 'incident.followed_up':
			return [`added a follow-up note to ${incidentKind(d.kind)} on `, incidentsRef(d, refs)];
		case 'incident.closed':
			return [`closed ${incidentKind(d.kind)} on `, incidentsRef(d, refs)];
		default:
			return [fallbackWords(action)];
	}
}

/** An action this module does not know yet: its words, never its key. */
function fallbackWords(action: string): string {
	const [thing, verb] = action.split('.');
	if (!verb) return 'made a change';
	return `${verb.replace(/_/g, ' ')} a ${thing.replace(/_/g, ' ')}`;
}

/** The ids an entry's detail refers to, so the server can look them up in one go. */
export function referencedIds(action: string, detail: unknown) {
	const d: Detail = detail && typeof detail === 'object' ? (detail as Detail) : {};
	const ids = {
		people: [] as string[],
		shows: [] as string[],
		scenes: [] as string[],
		props: [] as string[]
	};
	const add = (to: string[], v: unknown) => {
		if (typeof v === 'string' && UUID.test(v)) to.push(v);
	};
	add(ids.people, d.personId);
	add(ids.people, d.person);
	add(ids.shows, d.show);
	if (action.startsWith('show.scene_')) add(ids.scenes, d.scene);
	add(ids.props, d.propId);
	return ids;
}
