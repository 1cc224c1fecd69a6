// @ts-check
// Long-running child processes (mail catcher, object store, app) started with `node`, never `npx`,
// so stopping them stops the real process.
import { spawn, spawnSync } from 'node:child_process';

/** @type {import('node:child_process').ChildProcess[]} */
const running = [];

/**
 * @param {string} name @param {string[]} args @param {NodeJS.ProcessEnv} env
 * @param {{ waitFor?: string | RegExp }} [opts]
 */
export function startChild(name, args, env, opts = {}) {
	const child = spawn(process.execPath, args, {
		env: { ...process.env, ...env },
		stdio: ['ignore', 'pipe', 'pipe']
	});
	running.push(child);
	return new Promise((resolve, reject) => {
		let ready = !opts.waitFor;
		if (ready) resolve(child);
		/** @param {Buffer} chunk */
		const onData = (chunk) => {
			const text = chunk.toString();
			process.stdout.write(text.replace(/^(?=.)/gm, ''));
			if (!ready && opts.waitFor && text.match(opts.waitFor)) {
				ready = true;
				resolve(child);
			}
		};
		child.stdout?.on('data', onData);
		child.stderr?.on('data', (c) => process.stderr.write(c));
		child.on('exit', (code) => {
			if (!ready) reject(new Error(`${name} exited with code ${code} before it was ready`));
		});
	});
}

/** Run a node script to completion, inheriting output; throws on failure. @param {string[]} args @param {NodeJS.ProcessEnv} env */
export function runNode(args, env) {
	const res = spawnSync(process.execPath, args, {
		env: { ...process.env, ...env },
		stdio: 'inherit'
	});
	if (res.status !== 0) throw new Error(`node ${args.join(' ')} failed with code ${res.status}`);
}

export function stopChildren() {
	for (const c of running) if (c.exitCode === null) c.kill('SIGTERM');
}
