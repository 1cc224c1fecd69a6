// @ts-check
// JavaScript each page loads on first open, gzipped, from the last build: what SvelteKit preloads
// for the page (its node, its layouts' nodes and the client entry, with their static imports), the
// same list it writes into the page's modulepreload links. `node scripts/bench/page-js.mjs [--json]`
// after a build; `npm run bench` runs it. Prints one row per page: its folder and the kilobytes.
import { readFileSync, readdirSync } from 'node:fs';
import { gzipSync } from 'node:zlib';

const OUT = '.svelte-kit/output';
const manifest = readFileSync(`${OUT}/server/manifest.js`, 'utf8');
const client = /client: \{[^}]*imports:(\[[^\]]*\])/.exec(manifest);
if (!client) throw new Error('No client entry in the server manifest: build the app first.');
/** @type {string[]} */
const entry = JSON.parse(client[1]);

/** Each node: the folder of its page or layout under src/routes, its kind and its imports. */
const nodes = readdirSync(`${OUT}/server/nodes`).flatMap((f) => {
	const text = readFileSync(`${OUT}/server/nodes/${f}`, 'utf8');
	const m = /entries\/pages\/(.*?)_?(page|layout)\.svelte\.js/.exec(text);
	const imports = /export const imports = (\[[^\]]*\])/.exec(text);
	if (!m || !imports) return [];
	return [
		{
			dir: m[1].replace(/\/$/, ''),
			kind: m[2],
			/** @type {string[]} */ imports: JSON.parse(imports[1])
		}
	];
});

/** @type {Map<string, number>} */
const sizes = new Map();
const gz = (/** @type {string} */ file) => {
	let n = sizes.get(file);
	if (n === undefined) {
		n = gzipSync(readFileSync(`${OUT}/client/${file}`), { level: 9 }).length;
		sizes.set(file, n);
	}
	return n;
};

const rows = nodes
	.filter((n) => n.kind === 'page')
	.map((page) => {
		const files = new Set(entry);
		for (const layout of nodes)
			if (
				layout.kind === 'layout' &&
				(layout.dir === '' || page.dir === layout.dir || page.dir.startsWith(`${layout.dir}/`))
			)
				for (const f of layout.imports) files.add(f);
		for (const f of page.imports) files.add(f);
		let bytes = 0;
		for (const f of files) if (f.endsWith('.js')) bytes += gz(f);
		return { page: page.dir || '(root)', kb: bytes / 1024 };
	})
	.sort((a, b) => b.kb - a.kb);

if (process.argv.includes('--json')) console.log(JSON.stringify(rows));
else for (const r of rows) console.log(`${r.kb.toFixed(1).padStart(6)} KB  ${r.page}`);
