import { describe, expect, it } from 'vitest';
import { slugify } from './slug';

describe('slugify', () => {
	it('lower-cases and joins words with hyphens', () => {
		expect(slugify('Hollow Pines Trail')).toBe('hollow-pines-trail');
	});
	it('drops accents and punctuation', () => {
		expect(slugify("Ébène's  Gallery!")).toBe('ebene-s-gallery');
	});
	it('returns an empty string when nothing usable remains', () => {
		expect(slugify('!!!')).toBe('');
	});
});
