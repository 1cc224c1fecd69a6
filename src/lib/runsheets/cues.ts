import type { CueAction } from '../scenes/types';

/** A scene-relative time as m:ss, with tenths when the cue is not on a whole second: 0:04, 1:02.5. */
export function cueClock(ms: number): string {
	const tenths = Math.round(ms / 100);
	const whole = Math.floor(tenths / 10);
	const m = Math.floor(whole / 60);
	const s = String(whole % 60).padStart(2, '0');
	return tenths % 10 ? `${m}:${s}.${tenths % 10}` : `${m}:${s}`;
}

function seconds(ms: number): string {
	const s = Math.round(ms / 100) / 10;
	return `${s} s`;
}

function percent(level: number): string {
	return `${Math.round(level * 100)} %`;
}

export interface CueOutput {
	name: string;
	kind: 'led' | 'relay';
}

/** One line for a crew member: "0:03 pulse Drop valve for 0.3 s". */
export function cueLine(startMs: number, action: CueAction, output: CueOutput): string {
	const at = cueClock(startMs);
	const relay = output.kind === 'relay';
	switch (action.type) {
		case 'set':
			if (relay) return `${at} switch ${output.name} ${action.level > 0 ? 'on' : 'off'}`;
			return `${at} set ${output.name} to ${percent(action.level)}`;
		case 'fade':
			return `${at} fade ${output.name} to ${percent(action.level)} over ${seconds(action.durationMs)}`;
		case 'pulse':
			return `${at} pulse ${output.name} for ${seconds(action.durationMs)}`;
		case 'strobe':
			return `${at} strobe ${output.name} at ${action.rateHz} Hz for ${seconds(action.durationMs)}`;
	}
}

/** A live response, which has no time: "Live: Warm lanterns follow Well-lip plate". */
export function responseLine(outputName: string, sensorName: string): string {
	return `Live: ${outputName} follows ${sensorName}`;
}
