import {
	DeleteObjectCommand,
	GetObjectCommand,
	HeadObjectCommand,
	PutObjectCommand,
	S3Client
} from '@aws-sdk/client-s3';
import { createReadStream } from 'node:fs';
import { stat } from 'node:fs/promises';
import type { Readable } from 'node:stream';

export interface ObjectStoreConfig {
	endpoint: string;
	bucket: string;
	accessKeyId: string;
	secretAccessKey: string;
}

/** The S3-compatible store for uploads: captures, photos, wiring files. */
export class ObjectStore {
	private readonly client: S3Client;
	readonly bucket: string;

	constructor(config: ObjectStoreConfig) {
		this.bucket = config.bucket;
		this.client = new S3Client({
			endpoint: config.endpoint,
			region: 'us-east-1',
			forcePathStyle: true,
			// Newer SDKs add CRC checksums by default, sending uploads as 'aws-chunked' bodies; stores
			// that don't know that encoding (the local fake among them) keep the chunk framing as if it
			// were the file. Checksums only when an operation requires them; SHA-256 is ours anyway.
			requestChecksumCalculation: 'WHEN_REQUIRED',
			responseChecksumValidation: 'WHEN_REQUIRED',
			credentials: { accessKeyId: config.accessKeyId, secretAccessKey: config.secretAccessKey }
		});
	}

	/** Upload a file from disk, streamed, with its length known. */
	async putFile(key: string, path: string, contentType: string): Promise<void> {
		const { size } = await stat(path);
		await this.client.send(
			new PutObjectCommand({
				Bucket: this.bucket,
				Key: key,
				Body: createReadStream(path),
				ContentLength: size,
				ContentType: contentType
			})
		);
	}

	async get(key: string): Promise<{ body: Readable; size: number | undefined }> {
		const res = await this.client.send(new GetObjectCommand({ Bucket: this.bucket, Key: key }));
		return { body: res.Body as Readable, size: res.ContentLength };
	}

	/** The object, or null when the store has nothing under the key (never stored, or removed). */
	async find(key: string): Promise<{ body: Readable; size: number | undefined } | null> {
		try {
			return await this.get(key);
		} catch (e) {
			const err = e as { name?: string; $metadata?: { httpStatusCode?: number } };
			if (err.name === 'NoSuchKey' || err.$metadata?.httpStatusCode === 404) return null;
			throw e;
		}
	}

	async exists(key: string): Promise<boolean> {
		try {
			await this.client.send(new HeadObjectCommand({ Bucket: this.bucket, Key: key }));
			return true;
		} catch {
			return false;
		}
	}

	async remove(key: string): Promise<void> {
		await this.client.send(new DeleteObjectCommand({ Bucket: this.bucket, Key: key }));
	}
}

let shared: ObjectStore | null = null;

/** The app's store, configured from S3_* variables (see .env.example). */
export function objectStore(env: Record<string, string | undefined>): ObjectStore {
	if (!shared) {
		const missing = ['S3_ENDPOINT', 'S3_BUCKET', 'S3_ACCESS_KEY_ID', 'S3_SECRET_ACCESS_KEY'].filter(
			(n) => !env[n]
		);
		if (missing.length) throw new Error(`${missing.join(', ')} not set. See .env.example.`);
		shared = new ObjectStore({
			endpoint: env.S3_ENDPOINT!,
			bucket: env.S3_BUCKET!,
			accessKeyId: env.S3_ACCESS_KEY_ID!,
			secretAccessKey: env.S3_SECRET_ACCESS_KEY!
		});
	}
	return shared;
}
