import { applyCurve, type BrightnessCurve } from '../curves/curve';
import { dutySwatch } from '../curves/lightness';
import { levelAt } from './timeline';
import type { Output, Scene } from './types';

/**
 * Screen colours (sRGB) of each LED colour at full light. A display approximation of each kind's
 * usual hue, no published source; infrared is invisible to guests and shown as a deep red so the
 * preview still moves.
 */
export const LED_SCREEN_COLOURS: Record<string, string> = {
	red: '#ff2010',
	orange: '#ff7010',
	amber: '#ffb000',
	'yellow-green': '#b0ff20',
	green: '#20ff60',
	blue: '#2060ff',
	white: '#ffffff',
	infrared: '#a01818'
};

/**
 * The swatch for an LED at a PWM duty. The duty is the LED's light in linear terms (relative
 * luminance), so it scales the colour's linear light and is encoded with the sRGB transfer
 * function (IEC 61966-2-1): the swatch looks as bright as the LED would.
 */
export function ledSwatch(duty: number, colour: string | null | undefined): string {
	return dutySwatch(duty, LED_SCREEN_COLOURS[colour ?? 'white'] ?? '#ffffff');
}

/** An output as the preview needs it: the scene model plus its colour and brightness curve. */
export interface PreviewOutput extends Output {
	colour?: string | null;
	curve?: BrightnessCurve | null;
}

export interface PreviewState {
	outputId: string;
	/** Level 0..1 from the timeline and responses. */
	level: number;
	/** PWM duty 0..1 after the brightness curve (relays: 1 when on). */
	duty: number;
	on: boolean;
	/** Screen colour of an LED's swatch; null for relays. */
	swatch: string | null;
}

/** What every output of a scene does at a moment on the timeline with the sensors at these depths. */
export function previewAt(
	scene: Scene,
	outputs: PreviewOutput[],
	tMs: number,
	depths: Record<string, number> = {}
): PreviewState[] {
	return outputs.map((output) => {
		const level = levelAt(scene, output.id, tMs, { kind: output.kind, depths });
		if (output.kind === 'relay') {
			return { outputId: output.id, level, duty: level, on: level > 0, swatch: null };
		}
		const duty = output.curve ? applyCurve(output.curve, level) : level;
		return {
			outputId: output.id,
			level,
			duty,
			on: duty > 0,
			swatch: ledSwatch(duty, output.colour)
		};
	});
}
