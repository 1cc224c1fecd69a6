import { describe, expect, it } from 'vitest';
import { readdirSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { match as isUuidParam } from '../../src/params/uuid';

// Ids in paths are UUIDs: a route folder for an id uses the uuid matcher, so a path like
// /shows/not-an-id matches no route and is a 404 before any handler or query runs.
const ROUTES = 'src/routes';
// Parameters that are not database ids: the venue's slug, a calculator's name, one-time tokens.
const NOT_IDS = new Set(['venue', 'name', 'token']);

function paramFolders(dir: string): string[] {
	return readdirSync(dir).flatMap((name) => {
		const path = join(dir, name);
		if (!statSync(path).isDirectory()) return [];
		return [...(/\[/.test(name) ? [path] : []), ...paramFolders(path)];
	});
}

describe('uuid param matcher', () => {
	it('takes a UUID in either case and nothing else', () => {
		expect(isUuidParam('0b5f6f2e-8d1c-4c55-9a43-1f1f0e9d2a10')).toBe(true);
		expect(isUuidParam('0B5F6F2E-8D1C-4C55-9A43-1F1F0E9D2A10')).toBe(true);
		for (const bad of [
			'',
			'new',
			'1',
			'0b5f6f2e-8d1c-4c55-9a43-1f1f0e9d2a1',
			'0b5f6f2e-8d1c-4c55-9a43-1f1f0e9d2a10x',
			' 0b5f6f2e-8d1c-4c55-9a43-1f1f0e9d2a10',
			'0b5f6f2e-8d1c-4c55-9a43-1f1f0e9d2a10\u0000',
			"0b5f6f2e' OR '1'='1",
			'../0b5f6f2e-8d1c-4c55-9a43-1f1f0e9d2a10'
		])
			expect(isUuidParam(bad), JSON.stringify(bad)).toBe(false);
	});

	it('is used by every route folder whose parameter is an id', () => {
		const folders = paramFolders(ROUTES);
		const params = folders.flatMap((f) =>
			[
				...f
					.split('/')
					.pop()!
					.matchAll(/\[([^\]=]+)(?:=([^\]]+))?\]/g)
			].map((m) => ({
				folder: f,
				name: m[1],
				matcher: m[2]
			}))
		);
		const ids = params.filter((p) => !NOT_IDS.has(p.name));
		// The id folders this app has today, so a rename cannot quietly empty the check.
		expect(new Set(ids.map((p) => p.name))).toEqual(
			new Set([
				'show',
				'prop',
				'scene',
				'season',
				'person',
				'sensor',
				'output',
				'file',
				'result',
				'controller'
			])
		);
		const unmatched = ids.filter((p) => p.matcher !== 'uuid').map((p) => p.folder);
		expect(unmatched).toEqual([]);
	});
});
