import { describe, expect, it } from 'vitest';
import { parseHexColour } from '../curves/lightness';
import { ledSwatch, previewAt } from './preview';
import type { Scene } from './types';

/** The sRGB transfer functions exactly as IEC 61966-2-1 writes them. */
const decode = (v: number) => (v <= 0.04045 ? v / 12.92 : ((v + 0.055) / 1.055) ** 2.4);
const encode = (l: number) => (l <= 0.0031308 ? 12.92 * l : 1.055 * l ** (1 / 2.4) - 0.055);
const bytes = (hex: string) => parseHexColour(hex).map((c) => Math.round(c * 255));

describe('ledSwatch', () => {
	it('encodes a white LED duty with the sRGB transfer function', () => {
		// IEC 61966-2-1: encoding 0.18 gives 0.4613561295, 117.65 of 255.
		expect(bytes(ledSwatch(0.18, 'white'))).toEqual([118, 118, 118]);
		expect(ledSwatch(0, 'white')).toBe('#000000');
		expect(ledSwatch(1, 'white')).toBe('#ffffff');
	});

	it('scales a coloured LED in linear light, channel by channel (IEC 61966-2-1)', () => {
		// amber shows as #ffb000 at full
		const full = [255, 176, 0].map((b) => b / 255);
		for (const duty of [0.05, 0.3, 0.72]) {
			const expected = full.map((c) => Math.round(encode(decode(c) * duty) * 255));
			expect(bytes(ledSwatch(duty, 'amber'))).toEqual(expected);
		}
	});

	it('uses white for an unknown colour', () => {
		expect(ledSwatch(0.18, 'ultraviolet')).toBe(ledSwatch(0.18, 'white'));
	});
});

describe('previewAt', () => {
	const scene: Scene = {
		lengthMs: 4000,
		rearmMs: 0,
		cues: [
			{ id: 'p', outputId: 'valve', startMs: 1000, action: { type: 'pulse', durationMs: 500 } }
		],
		responses: [{ id: 'r', sensorId: 'plate', outputId: 'leds', shape: 'rise' }]
	};
	const outputs = [
		{
			id: 'leds',
			name: 'LEDs',
			kind: 'led' as const,
			currentAtFull: 0.08,
			colour: 'white',
			curve: { kind: 'cie' as const }
		},
		{ id: 'valve', name: 'Valve', kind: 'relay' as const, currentAtFull: 0.07 }
	];

	it('puts the level through the brightness curve and the duty into the swatch', () => {
		const [leds] = previewAt(scene, outputs, 0, { plate: 0.5 });
		expect(leds.level).toBeCloseTo(0.5, 12);
		// CIE 015:2004: L* = 50 is relative luminance 0.1841865185.
		expect(leds.duty).toBeCloseTo(0.1841865185, 9);
		expect(leds.swatch).toBe(ledSwatch(leds.duty, 'white'));
	});

	it('brightens the swatch as the depth grows', () => {
		const lum = (depth: number) =>
			bytes(previewAt(scene, outputs, 0, { plate: depth })[0].swatch!).reduce((a, b) => a + b);
		expect(lum(0.2)).toBeLessThan(lum(0.5));
		expect(lum(0.5)).toBeLessThan(lum(0.9));
	});

	it('shows relays on and off along the timeline', () => {
		expect(previewAt(scene, outputs, 900)[1]).toMatchObject({ on: false, swatch: null });
		expect(previewAt(scene, outputs, 1200)[1]).toMatchObject({ on: true, duty: 1 });
		expect(previewAt(scene, outputs, 1500)[1].on).toBe(false);
	});
});
