import { describe, expect, it } from 'vitest';
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import ts from 'typescript';

// Every server handler that can touch venue data must call a guard itself; the hook's coarse
// check is the second layer, not the only one. Handlers that are public on purpose say so
// in a comment starting with "Public" directly above them.
const ROUTES = 'src/routes';
const GUARDS = /\brequire(Role|Person)\s*\(/;
const HTTP = new Set(['GET', 'POST', 'PUT', 'PATCH', 'DELETE', 'HEAD', 'OPTIONS', 'fallback']);

function serverFiles(dir: string): string[] {
	return readdirSync(dir).flatMap((name) => {
		const path = join(dir, name);
		if (statSync(path).isDirectory()) return serverFiles(path);
		return /^\+(page|layout)\.server\.ts$|^\+server\.ts$/.test(name) ? [path] : [];
	});
}

interface Handler {
	file: string;
	name: string;
	guarded: boolean;
	public: boolean;
}

function isPublic(node: ts.Node, source: ts.SourceFile) {
	const comments = ts.getLeadingCommentRanges(source.text, node.getFullStart()) ?? [];
	return comments.some((c) => /^\/\/\s*Public\b/.test(source.text.slice(c.pos, c.end)));
}

export function handlersIn(file: string, text = readFileSync(file, 'utf8')): Handler[] {
	const source = ts.createSourceFile(file, text, ts.ScriptTarget.Latest, true);
	const out: Handler[] = [];
	const add = (name: string, body: ts.Node, docNode: ts.Node) =>
		out.push({
			file,
			name,
			guarded: GUARDS.test(body.getText(source)),
			public: isPublic(docNode, source)
		});
	for (const stmt of source.statements) {
		if (!ts.isVariableStatement(stmt)) continue;
		if (!stmt.modifiers?.some((m) => m.kind === ts.SyntaxKind.ExportKeyword)) continue;
		for (const decl of stmt.declarationList.declarations) {
			const name = decl.name.getText(source);
			const init = decl.initializer;
			if (!init) continue;
			if (name === 'load' || HTTP.has(name)) add(name, init, stmt);
			if (name === 'actions' && ts.isObjectLiteralExpression(init)) {
				for (const prop of init.properties) {
					const body = ts.isPropertyAssignment(prop) ? prop.initializer : prop;
					add(`actions.${prop.name?.getText(source)}`, body, prop);
				}
			}
		}
	}
	return out;
}

describe('route guards', () => {
	const handlers = serverFiles(ROUTES).flatMap((f) => handlersIn(f));

	it('finds the server handlers', () => {
		expect(handlers.length).toBeGreaterThan(15);
	});

	it('every handler calls requireRole or requirePerson, or is marked public', () => {
		const unguarded = handlers
			.filter((h) => !h.guarded && !h.public)
			.map((h) => `${relative('.', h.file)} ${h.name}`);
		expect(unguarded).toEqual([]);
	});

	it('every handler under a [venue] route checks the role, not only sign-in', () => {
		const weak = handlers
			.filter(
				(h) =>
					h.file.includes('[venue]') && !/\brequireRole\s*\(/.test(readFileSync(h.file, 'utf8'))
			)
			.map((h) => `${relative('.', h.file)} ${h.name}`);
		expect(weak).toEqual([]);
	});

	it('public handlers never live under a [venue] route', () => {
		expect(
			handlers.filter((h) => h.public && h.file.includes('[venue]')).map((h) => h.file)
		).toEqual([]);
	});

	it('the checker itself catches a handler without a guard', () => {
		const sample = `export const load = async () => ({ a: 1 });
export const actions = {
	save: async (event) => { requireRole(event, 'owner'); },
	// Public: a sample
	hello: async () => {},
	sneak: async () => {}
};`;
		const found = handlersIn('sample/+page.server.ts', sample);
		expect(found.filter((h) => !h.guarded && !h.public).map((h) => h.name)).toEqual([
			'load',
			'actions.sneak'
		]);
	});
});
