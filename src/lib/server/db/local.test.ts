import { describe, expect, it } from 'vitest';
import { isLocalDatabaseUrl } from './local';

describe('isLocalDatabaseUrl', () => {
	it('accepts loopback addresses', () => {
		expect(isLocalDatabaseUrl('postgres://u:p@127.0.0.1:5532/gloaming')).toBe(true);
		expect(isLocalDatabaseUrl('postgres://u:p@localhost/gloaming')).toBe(true);
		expect(isLocalDatabaseUrl('postgres://u:p@[::1]:5432/gloaming')).toBe(true);
	});
	it('refuses hosted databases and nonsense', () => {
		expect(isLocalDatabaseUrl('postgres://u:p@db.example.com:5432/gloaming')).toBe(false);
		expect(isLocalDatabaseUrl('postgres://u:p@10.0.0.5/gloaming')).toBe(false);
		expect(isLocalDatabaseUrl('not a url')).toBe(false);
	});
});
