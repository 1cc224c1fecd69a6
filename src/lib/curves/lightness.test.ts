import { describe, expect, it } from 'vitest';
import {
	CIE_EPSILON,
	dutySwatch,
	lightnessFromLuminance,
	lightnessOfDuty,
	luminanceFromLightness,
	parseHexColour,
	srgbDecode,
	srgbEncode
} from './lightness';

describe('CIE 1976 lightness', () => {
	it('turns L* into relative luminance', () => {
		// CIE 015:2004: L*=50 -> Y=0.1841865185
		expect(luminanceFromLightness(50)).toBeCloseTo(0.1841865185, 10);
		// CIE 015:2004: L*=8 sits on the breakpoint, Y = eps = 216/24389 = 0.0088564517
		expect(luminanceFromLightness(8)).toBeCloseTo(0.0088564517, 10);
		// CIE 015:2004: L*=0 -> Y=0, L*=100 -> Y=1
		expect(luminanceFromLightness(0)).toBe(0);
		expect(luminanceFromLightness(100)).toBeCloseTo(1, 14);
	});

	it('uses the straight segment below L* = 8', () => {
		// CIE 015:2004: Y = L*/kappa below the breakpoint, kappa = 24389/27; L*=4 -> 4*27/24389
		expect(luminanceFromLightness(4)).toBeCloseTo((4 * 27) / 24389, 15);
	});

	it('turns relative luminance into L*', () => {
		// CIE 015:2004: Y=0.1841865185 -> L*=50
		expect(lightnessFromLuminance(0.1841865185)).toBeCloseTo(50, 8);
		// CIE 015:2004: Y = eps -> L* = kappa * eps = 8 on both branches
		expect(lightnessFromLuminance(CIE_EPSILON)).toBeCloseTo(8, 12);
		expect(lightnessFromLuminance(CIE_EPSILON * (1 + 1e-12))).toBeCloseTo(8, 9);
		// CIE 015:2004 formula worked here: Y=0.18 -> 116*0.18^(1/3) - 16 = 49.4961...
		expect(lightnessFromLuminance(0.18)).toBeCloseTo(116 * Math.cbrt(0.18) - 16, 12);
		expect(lightnessFromLuminance(0.18)).toBeCloseTo(49.4961, 4);
	});

	it('forward and inverse undo each other across the range', () => {
		// ISO/CIE 11664-4: the inverse formula is the exact inverse of the forward one
		for (let l = 0; l <= 100; l += 0.5) {
			expect(lightnessFromLuminance(luminanceFromLightness(l))).toBeCloseTo(l, 9);
		}
	});

	it('gives the lightness of a duty, clamped to 0..1', () => {
		// CIE 015:2004: Y=1 -> L*=100, Y=0 -> L*=0
		expect(lightnessOfDuty(1)).toBeCloseTo(100, 12);
		expect(lightnessOfDuty(2)).toBeCloseTo(100, 12);
		expect(lightnessOfDuty(-1)).toBe(0);
	});
});

describe('sRGB transfer', () => {
	it('decodes and encodes the published values', () => {
		// IEC 61966-2-1 sRGB: decode 0.5 -> 0.2140411405
		expect(srgbDecode(0.5)).toBeCloseTo(0.2140411405, 10);
		// IEC 61966-2-1 sRGB: encode 0.18 -> 0.4613561295
		expect(srgbEncode(0.18)).toBeCloseTo(0.4613561295, 10);
		// IEC 61966-2-1 sRGB: 0 and 1 are fixed points
		expect(srgbEncode(0)).toBe(0);
		expect(srgbDecode(1)).toBeCloseTo(1, 14);
	});

	it('meets at the knee within about 1e-7', () => {
		// IEC 61966-2-1 sRGB: linear segment below 0.04045 encoded / 0.0031308 linear
		expect(srgbDecode(0.04045)).toBeCloseTo(0.04045 / 12.92, 12);
		expect(srgbEncode(0.0031308)).toBeCloseTo(0.04045, 6);
		expect(Math.abs(srgbEncode(0.0031308 * (1 + 1e-9)) - 0.04045)).toBeLessThan(1e-7);
	});

	it('round-trips', () => {
		// IEC 61966-2-1 sRGB: encode is the inverse of decode
		for (let v = 0; v <= 1; v += 0.01) expect(srgbEncode(srgbDecode(v))).toBeCloseTo(v, 6);
	});
});

describe('dutySwatch', () => {
	it('shows a duty as a screen grey', () => {
		// IEC 61966-2-1 sRGB: linear 0.18 -> 0.4613561295 -> 117.6 of 255 -> 0x76
		expect(dutySwatch(0.18)).toBe('#767676');
		// IEC 61966-2-1 sRGB: linear 0 and 1 are black and white
		expect(dutySwatch(0)).toBe('#000000');
		expect(dutySwatch(1)).toBe('#ffffff');
	});

	it('scales a coloured LED in linear light', () => {
		// IEC 61966-2-1 sRGB formulas worked here: decode each channel, scale by the duty, encode
		const decode = (v: number) => (v <= 0.04045 ? v / 12.92 : ((v + 0.055) / 1.055) ** 2.4);
		const encode = (l: number) => (l <= 0.0031308 ? 12.92 * l : 1.055 * l ** (1 / 2.4) - 0.055);
		const expected = [255, 0xbf, 0x20].map((c) => Math.round(encode(decode(c / 255) * 0.3) * 255));
		expect(parseHexColour(dutySwatch(0.3, '#ffbf20')).map((c) => Math.round(c * 255))).toEqual(
			expected
		);
	});

	it('rejects a colour that is not hex', () => {
		// CSS Color 4 hex notation: #rgb or #rrggbb
		expect(() => dutySwatch(0.5, 'amber')).toThrow(RangeError);
		expect(parseHexColour('#fa0')).toEqual([1, 0xaa / 255, 0]);
	});
});
