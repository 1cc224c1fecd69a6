import { inject } from 'vitest';
import { ObjectStore } from '../../src/lib/server/objects';

/** The object-store fake that global-setup starts for the integration tests. */
export function testStore() {
	return new ObjectStore({
		endpoint: inject('s3Endpoint'),
		bucket: 'gloaming-it',
		accessKeyId: 'S3RVER',
		secretAccessKey: 'S3RVER'
	});
}

/** A 1×1 PNG, the smallest real photo. */
export const PNG_1x1 = Buffer.from(
	'iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNk+M9QDwADhgGAWjR9awAAAABJRU5ErkJggg==',
	'base64'
);

/** An upload request whose body is the file itself, as the browser sends it. */
export const uploadBody = (data: string | Uint8Array) =>
	new Request('http://x/', { method: 'POST', body: data as BodyInit });
