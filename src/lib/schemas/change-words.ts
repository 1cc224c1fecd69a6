/** The parts of a prop whose change after a signed-off night asks for a reason and a re-test. */
export const CHANGE_PARTS = ['sensor', 'trigger_range', 'output', 'curve'] as const;
export type ChangePart = (typeof CHANGE_PARTS)[number];

export const CHANGE_PART_LABELS: Record<ChangePart, string> = {
	sensor: 'Sensor settings',
	trigger_range: 'Trigger range from a capture',
	output: 'Output settings',
	curve: 'Brightness curve'
};
