// @ts-check
// A per-checkout AUTH_SECRET for local use, kept in .data/ (git-ignored).
import { randomBytes } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';

export function localSecret(file = '.data/auth-secret') {
	if (process.env.AUTH_SECRET) return process.env.AUTH_SECRET;
	if (!existsSync(file)) {
		mkdirSync('.data', { recursive: true });
		writeFileSync(file, randomBytes(32).toString('base64url'), { mode: 0o600 });
	}
	return readFileSync(file, 'utf8').trim();
}
