// @ts-check
// Programs Gloaming runs beside itself, installed from Debian's packages when they are missing.
// As root the packages are installed in one apt-get call; otherwise we stop at once with the command to run.
import { execFileSync } from 'node:child_process';
import { existsSync } from 'node:fs';

const isRoot = typeof process.getuid === 'function' && process.getuid() === 0;

/** @typedef {{ pkg: string, present: () => boolean, what: string }} Need */

/** @param {Need[]} needs */
export function ensureDebianPackages(needs) {
	const missing = needs.filter((n) => !n.present());
	if (missing.length === 0) return;
	const pkgs = missing.map((n) => n.pkg);
	const what = missing.map((n) => n.what).join(', ');
	if (!isRoot) {
		console.error(
			`[setup] ${what} ${missing.length > 1 ? 'are' : 'is'} missing. Install with:\n  sudo apt-get install -y ${pkgs.join(' ')}`
		);
		process.exit(2);
	}
	console.log(`[setup] installing ${pkgs.join(' ')} from Debian's packages (${what})`);
	const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
	execFileSync('apt-get', ['update', '-qq'], { stdio: 'inherit', env });
	execFileSync('apt-get', ['install', '-y', '-qq', ...pkgs], { stdio: 'inherit', env });
}

/** @param {string} path */
export const hasFile = (path) => () => existsSync(path);
