// The local object-store fake: an S3-compatible server on 127.0.0.1 with files under .data/.
// Development and tests only; production points S3_ENDPOINT at a real store.
import { mkdirSync } from 'node:fs';
import S3rver from 's3rver';

const port = Number(process.env.S3_PORT ?? 5530);
const directory = process.env.S3_DIR ?? '.data/objects-dev';
const bucket = process.env.S3_BUCKET ?? 'gloaming';
mkdirSync(directory, { recursive: true });

const server = new S3rver({
	port,
	address: '127.0.0.1',
	directory,
	silent: true,
	configureBuckets: [{ name: bucket, configs: [] }]
});

server.run().then(() => {
	console.log(`[objects] S3-compatible store on http://127.0.0.1:${port}/ (bucket ${bucket})`);
});

async function shutdown() {
	await server.close().catch(() => {});
	process.exit(0);
}
process.on('SIGTERM', shutdown);
process.on('SIGINT', shutdown);
