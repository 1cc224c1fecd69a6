/** CIE 1976 constants as exact ratios (CIE 015:2004). */
export const CIE_EPSILON = 216 / 24389;
export const CIE_KAPPA = 24389 / 27;

function clampUnit(value: number): number {
	return value < 0 ? 0 : value > 1 ? 1 : value;
}

/** CIE 1976 lightness L* (0..100) of a relative luminance Y (0..1, white = 1). */
export function lightnessFromLuminance(luminance: number): number {
	return luminance > CIE_EPSILON ? 116 * Math.cbrt(luminance) - 16 : CIE_KAPPA * luminance;
}

/** Relative luminance Y (0..1) of a CIE 1976 lightness L* (0..100). */
export function luminanceFromLightness(lightness: number): number {
	// kappa * epsilon is exactly 8, so both branches meet at L* = 8.
	return lightness > 8 ? ((lightness + 16) / 116) ** 3 : lightness / CIE_KAPPA;
}

/** Perceived lightness L* (0..100) of a PWM duty, taking light output as proportional to duty. */
export function lightnessOfDuty(duty: number): number {
	return lightnessFromLuminance(clampUnit(duty));
}

/** sRGB transfer (IEC 61966-2-1): linear light 0..1 to encoded value 0..1. */
export function srgbEncode(linear: number): number {
	const l = clampUnit(linear);
	return l <= 0.0031308 ? 12.92 * l : 1.055 * l ** (1 / 2.4) - 0.055;
}

/** sRGB transfer (IEC 61966-2-1): encoded value 0..1 to linear light 0..1. */
export function srgbDecode(encoded: number): number {
	const v = clampUnit(encoded);
	return v <= 0.04045 ? v / 12.92 : ((v + 0.055) / 1.055) ** 2.4;
}

export type Rgb = [number, number, number];

/** Parses '#rgb' or '#rrggbb' into encoded sRGB channels 0..1. */
export function parseHexColour(hex: string): Rgb {
	const match = /^#?([0-9a-f]{3}|[0-9a-f]{6})$/i.exec(hex.trim());
	if (!match) throw new RangeError(`colour '${hex}' is not #rgb or #rrggbb`);
	let digits = match[1];
	if (digits.length === 3) digits = [...digits].map((d) => d + d).join('');
	return [0, 2, 4].map((i) => parseInt(digits.slice(i, i + 2), 16) / 255) as Rgb;
}

export function toHexColour(rgb: Rgb): string {
	return (
		'#' +
		rgb
			.map((c) =>
				Math.round(clampUnit(c) * 255)
					.toString(16)
					.padStart(2, '0')
			)
			.join('')
	);
}

/**
 * A screen colour for an LED at a duty: the LED's full colour is decoded to linear light,
 * scaled by the duty (light adds linearly), and encoded again so the swatch looks right.
 */
export function dutySwatch(duty: number, fullColour = '#ffffff'): string {
	const d = clampUnit(duty);
	const full = parseHexColour(fullColour);
	return toHexColour(full.map((c) => srgbEncode(srgbDecode(c) * d)) as Rgb);
}
