/**
 * The close-of-night checklist of one show, worked after doors close: per fog output its fluid
 * drained or refilled, per pneumatic prop its air lines bled, per strobe output the strobe off, and
 * for the venue the doors locked, incidents written up and guest counts entered, plus a line for
 * each output whose maintenance is due. Pure, like generateChecklist: the server stores the lines by
 * key, so ticks stay with their line when the list is made again.
 */

export const CLOSE_KINDS = ['fog', 'air', 'strobe', 'venue', 'guests', 'maintenance'] as const;
export type CloseKind = (typeof CLOSE_KINDS)[number];

export interface CloseInput {
	rooms: { id: string; name: string; position: number }[];
	/** Props used by the night's scenes. */
	props: { id: string; name: string; roomId: string | null }[];
	outputs: { id: string; propId: string; name: string; relayKind: string | null }[];
	/** Outputs whose maintenance is due, with the key of what it is due since. */
	maintenance: { outputId: string; propId: string; since: string; line: string }[];
}

export interface CloseSpec {
	key: string;
	kind: CloseKind;
	propId: string | null;
	outputId: string | null;
	roomId: string | null;
	label: string;
	detail: string;
	required: boolean;
	sortKey: string;
}

const pad = (n: number) => String(n).padStart(4, '0');

export function generateCloseChecklist(input: CloseInput): CloseSpec[] {
	const roomPos = new Map(input.rooms.map((r) => [r.id, r.position]));
	const roomOrder = (roomId: string | null) => (roomId ? (roomPos.get(roomId) ?? 9000) : 9999);
	const propOf = new Map(input.props.map((p) => [p.id, p]));
	const specs: CloseSpec[] = [];
	const base = { propId: null, outputId: null, roomId: null, required: true };

	const props = [...input.props].sort(
		(a, b) => roomOrder(a.roomId) - roomOrder(b.roomId) || a.name.localeCompare(b.name)
	);
	props.forEach((prop, p) => {
		const at = (n: number) => `${pad(roomOrder(prop.roomId))}|${pad(p)}|${pad(n)}`;
		let n = 0;
		const outs = input.outputs
			.filter((o) => o.propId === prop.id)
			.sort((a, b) => a.name.localeCompare(b.name));
		for (const o of outs.filter((o) => o.relayKind === 'fog'))
			specs.push({
				...base,
				key: `fog:${o.id}`,
				kind: 'fog',
				propId: prop.id,
				outputId: o.id,
				roomId: prop.roomId,
				label: `${prop.name}: fog fluid in ${o.name} drained or refilled`,
				detail:
					"Machine off and cool; fluid topped up for tomorrow or drained for a dark night, to the maker's instructions.",
				sortKey: at(n++)
			});
		if (outs.some((o) => o.relayKind === 'pneumatic'))
			specs.push({
				...base,
				key: `air:${prop.id}`,
				kind: 'air',
				propId: prop.id,
				roomId: prop.roomId,
				label: `${prop.name}: air lines bled`,
				detail: 'Supply shut off and stored air dumped, so nothing moves while the prop stands.',
				sortKey: at(n++)
			});
		for (const o of outs.filter((o) => o.relayKind === 'strobe'))
			specs.push({
				...base,
				key: `strobe:${o.id}`,
				kind: 'strobe',
				propId: prop.id,
				outputId: o.id,
				roomId: prop.roomId,
				label: `${prop.name}: ${o.name} strobe off`,
				detail: 'Switched off at its supply, not just idle.',
				sortKey: at(n++)
			});
	});
	input.maintenance.forEach((m, i) => {
		const prop = propOf.get(m.propId);
		specs.push({
			...base,
			key: `maintenance:${m.outputId}:${m.since}`,
			kind: 'maintenance',
			propId: m.propId,
			outputId: m.outputId,
			roomId: prop?.roomId ?? null,
			label: m.line,
			detail:
				'Its wear counter has passed its maintenance interval: do the maintenance and record it on the output page, which starts the counter again.',
			sortKey: `${pad(roomOrder(prop?.roomId ?? null))}|9998|${pad(i)}`
		});
	});
	const venueLine = (key: string, kind: CloseKind, label: string, detail: string, i: number) =>
		specs.push({ ...base, key, kind, label, detail, sortKey: `9999|9999|${pad(i)}` });
	venueLine(
		'venue:incidents',
		'venue',
		'Incidents and show stops written up',
		"Anything that happened to guests or crew tonight is written down while it's fresh.",
		0
	);
	venueLine(
		'venue:guests',
		'guests',
		'Guest counts entered',
		'Ticked by itself once tonight’s guest count is on the show page.',
		1
	);
	venueLine(
		'venue:doors',
		'venue',
		'Doors locked',
		'Every door locked and the building walked once more for anyone left inside.',
		2
	);
	return specs.sort((a, b) => a.sortKey.localeCompare(b.sortKey));
}
