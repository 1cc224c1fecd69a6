import { describe, expect, it } from 'vitest';
import { safeRedirect } from './safe-redirect';

// Hostile targets from the usual open-redirect tricks: scheme-relative paths, backslashes that
// browsers treat as slashes (WHATWG URL Standard, "special" schemes), tabs and new lines that the
// URL parser strips, percent-encoded and double-encoded forms of each, and other sites outright.
const hostile: unknown[] = [
	'//evil.example',
	'///evil.example',
	'/\\evil.example',
	'\\\\evil.example',
	'/%5Cevil.example',
	'/%5cevil.example',
	'/%2F%2Fevil.example',
	'%2F%2Fevil.example',
	'/%252F%252Fevil.example',
	'/%25255Cevil.example',
	'/\t/evil.example',
	'/\n/evil.example',
	'/%09/evil.example',
	'/%0a/evil.example',
	' /venues',
	'https://evil.example',
	'https://evil.example/venues',
	'http:evil.example',
	'http:/evil.example',
	'javascript:alert(1)',
	'data:text/html,hello',
	'evil.example',
	'venues',
	'/%E0%A4%A',
	'/' + 'a'.repeat(2100),
	'',
	undefined,
	null,
	42,
	['/venues'],
	{ toString: () => '/venues' }
];

describe('safeRedirect', () => {
	it.each(hostile.map((t) => [t]))('refuses %j', (target) => {
		expect(safeRedirect(target, { fallback: '/venues' })).toBe('/venues');
	});

	it.each([
		'/venues',
		'/',
		'/v/old-mill/shows?season=2026#tonight',
		'/sign-in?redirectTo=%2Fvenues',
		'/v/old-mill/props/a%20b'
	])('keeps the site path %s', (target) => {
		expect(safeRedirect(target)).toBe(target);
	});

	it('takes an absolute URL only on the given origin, as its path', () => {
		const origin = 'https://gloaming.example.org';
		expect(safeRedirect('https://gloaming.example.org/v/mill?x=1', { origin })).toBe('/v/mill?x=1');
		expect(safeRedirect('https://gloaming.example.org//evil.example', { origin })).toBe('/');
		expect(safeRedirect('https://gloaming.example.org/%5Cevil.example', { origin })).toBe('/');
		expect(safeRedirect('https://gloaming.example.org.evil.example/v', { origin })).toBe('/');
		expect(safeRedirect('http://gloaming.example.org/v', { origin })).toBe('/');
		expect(safeRedirect('not a url', { origin })).toBe('/');
		expect(safeRedirect('https://gloaming.example.org/v')).toBe('/');
	});
});
