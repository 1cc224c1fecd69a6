// Enum values and their labels for scenes, cues and responses (words from the glossary).
export const SCENE_TRIGGERS = ['sensor', 'timer', 'manual'] as const;
export type SceneTrigger = (typeof SCENE_TRIGGERS)[number];
export const SCENE_TRIGGER_LABELS: Record<SceneTrigger, string> = {
	sensor: 'A sensor entering its trigger range',
	timer: 'A timer loop',
	manual: 'By hand'
};

export const RESPONSE_SHAPES = ['rise', 'step', 'fall', 'points'] as const;
export type ResponseShape = (typeof RESPONSE_SHAPES)[number];
export const RESPONSE_SHAPE_LABELS: Record<ResponseShape, string> = {
	rise: 'Rises with depth',
	step: 'Steps at a threshold',
	fall: 'Falls with depth',
	points: 'Drawn points'
};

export const CUE_TYPES = ['set', 'fade', 'pulse', 'strobe'] as const;
export type CueTypeWord = (typeof CUE_TYPES)[number];
export const CUE_TYPE_LABELS: Record<CueTypeWord, string> = {
	set: 'Set a level',
	fade: 'Fade to a level',
	pulse: 'Pulse',
	strobe: 'Flicker / strobe'
};
