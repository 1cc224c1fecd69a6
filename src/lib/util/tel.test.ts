import { describe, expect, it } from 'vitest';
import { telHref } from './tel';

describe('telHref', () => {
	it('keeps the digits and a leading plus, dropping visual separators (RFC 3966 §5.1.1)', () => {
		expect(telHref('+1 (555) 010-4477')).toBe('tel:+15550104477');
		expect(telHref('0161 496 0000')).toBe('tel:01614960000');
		expect(telHref('555.0100')).toBe('tel:5550100');
	});
	it('gives nothing to dial for an empty or digit-less number', () => {
		expect(telHref(null)).toBeNull();
		expect(telHref('ask at the gate')).toBeNull();
		expect(telHref('12')).toBeNull();
	});
});
