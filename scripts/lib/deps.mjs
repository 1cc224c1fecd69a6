// @ts-check
// Install dependencies when they are missing or older than the lockfile.
import { execSync } from 'node:child_process';
import { existsSync, statSync } from 'node:fs';

export function ensureDependencies() {
	const marker = 'node_modules/.package-lock.json';
	const stale =
		!existsSync(marker) ||
		(existsSync('package-lock.json') &&
			statSync('package-lock.json').mtimeMs > statSync(marker).mtimeMs);
	if (!stale) return;
	console.log('[setup] installing dependencies (npm ci)…');
	execSync('npm ci --no-audit --no-fund', { stdio: 'inherit' });
}
