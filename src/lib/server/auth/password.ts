import { hash, verify } from '@node-rs/argon2';

// Argon2id with the library's defaults (memory 19 MiB, 2 passes), as OWASP's password storage guidance suggests.
export function hashPassword(password: string): Promise<string> {
	return hash(password);
}

export async function verifyPassword(stored: string, password: string): Promise<boolean> {
	try {
		return await verify(stored, password);
	} catch {
		return false;
	}
}
