import { describe, expect, it } from 'vitest';
import { dataPathOf, isKeptData, isKeptPage, pageOfData } from './paths';

const SHOW = '0b6f5a52-2f0e-4c7d-9d7a-6a1d3c1e2f00';

describe('which addresses a phone keeps', () => {
	it('keeps the venue list, Tonight, My nights and checklists, and nothing else', () => {
		for (const p of [
			'/venues',
			'/v/trail',
			'/v/trail/my-nights',
			`/v/trail/shows/${SHOW}/checklist`
		])
			expect(isKeptPage(p)).toBe(true);
		for (const p of [
			'/v/trail/props',
			`/v/trail/shows/${SHOW}`,
			`/v/trail/shows/${SHOW}/checklist/print`,
			'/v/trail/members',
			'/sign-in',
			'/v/Trail'
		])
			expect(isKeptPage(p)).toBe(false);
		expect(isKeptData(`/api/v/trail/shows/${SHOW}/checks`)).toBe(true);
		expect(isKeptData(`/api/v/trail/shows/${SHOW}/results`)).toBe(false);
	});

	it("names a page's data address and back", () => {
		// SvelteKit's in-app navigation loads <page>/__data.json.
		expect(dataPathOf('/v/trail')).toBe('/v/trail/__data.json');
		expect(pageOfData('/v/trail/__data.json')).toBe('/v/trail');
		expect(pageOfData('/v/trail')).toBeNull();
	});
});
