import {
	CreateBucketCommand,
	DeleteObjectsCommand,
	GetObjectCommand,
	HeadBucketCommand,
	ListObjectsV2Command,
	PutObjectCommand,
	S3Client,
	S3ServiceException
} from '@aws-sdk/client-s3';
import { env } from '$env/dynamic/private';
import { StorageUnavailableError, isStorageFailure } from '../http/unavailable';

/**
 * Object storage through the S3 API: hosted S3 (leave `S3_ENDPOINT` unset) or any
 * S3-compatible store, including the local fake in `fakes/s3.js`.
 *
 * Env: `S3_BUCKET` (required), `S3_REGION` (= us-east-1), `S3_ENDPOINT` (optional),
 * `S3_ACCESS_KEY_ID` + `S3_SECRET_ACCESS_KEY` (optional: else the SDK's default chain),
 * `S3_FORCE_PATH_STYLE` ('true' for most self-hosted stores).
 */

let client: S3Client | null = null;

/** The one S3 client of this process, built from env on first use (so `vite build` needs no S3 config). */
export function s3(): S3Client {
	if (client) return client;
	const accessKeyId = env.S3_ACCESS_KEY_ID;
	const secretAccessKey = env.S3_SECRET_ACCESS_KEY;
	client = new S3Client({
		region: env.S3_REGION || 'us-east-1',
		endpoint: env.S3_ENDPOINT || undefined,
		forcePathStyle: env.S3_FORCE_PATH_STYLE === 'true',
		credentials: accessKeyId && secretAccessKey ? { accessKeyId, secretAccessKey } : undefined,
		// Without these, newer SDKs append a checksum trailer to streamed bodies, which
		// some S3-compatible stores keep as part of the object (see STACK.md).
		requestChecksumCalculation: 'WHEN_REQUIRED',
		responseChecksumValidation: 'WHEN_REQUIRED',
		// An unreachable store fails within seconds (the request answers 503), not after minutes.
		maxAttempts: 2,
		requestHandler: { connectionTimeout: 3_000, requestTimeout: 30_000 }
	});
	return client;
}

/** The bucket name; throws a clear configuration error when it is missing. */
export function bucket(): string {
	const name = env.S3_BUCKET;
	if (!name) throw new Error('S3_BUCKET is not set: object storage is not configured.');
	return name;
}

/** Store `body` under `key`, replacing any object there. */
export async function putObject(
	key: string,
	body: Uint8Array,
	opts: { contentType: string; cacheControl?: string }
): Promise<void> {
	await s3().send(
		new PutObjectCommand({
			Bucket: bucket(),
			Key: key,
			Body: body,
			ContentLength: body.byteLength,
			ContentType: opts.contentType,
			CacheControl: opts.cacheControl
		})
	);
}

export interface StoredObject {
	body: ReadableStream<Uint8Array>;
	contentType: string | undefined;
	contentLength: number | undefined;
	etag: string | undefined;
	lastModified: Date | undefined;
}

function statusOf(err: unknown): number | undefined {
	if (err instanceof S3ServiceException) return err.$metadata.httpStatusCode;
	const meta = (err as { $metadata?: { httpStatusCode?: number } } | null)?.$metadata;
	return meta?.httpStatusCode;
}

function isMissing(err: unknown): boolean {
	const name = (err as { name?: string } | null)?.name;
	return name === 'NoSuchKey' || name === 'NotFound' || statusOf(err) === 404;
}

/**
 * Read an object as a web stream with its metadata. Returns null when the key does not exist,
 * and `'not-modified'` when `ifNoneMatch` equals the stored ETag.
 */
export async function getObject(
	key: string,
	opts: { ifNoneMatch?: string } = {}
): Promise<StoredObject | 'not-modified' | null> {
	try {
		const res = await s3().send(
			new GetObjectCommand({ Bucket: bucket(), Key: key, IfNoneMatch: opts.ifNoneMatch || undefined })
		);
		if (!res.Body) return null;
		return {
			body: res.Body.transformToWebStream() as ReadableStream<Uint8Array>,
			contentType: res.ContentType,
			contentLength: res.ContentLength,
			etag: res.ETag,
			lastModified: res.LastModified
		};
	} catch (err) {
		if (statusOf(err) === 304) return 'not-modified';
		if (isMissing(err)) return null;
		throw isStorageFailure(err) ? new StorageUnavailableError(err) : err;
	}
}

/** Read a whole object into memory (small objects only: tests, thumbnails). Null when missing. */
export async function getObjectBytes(key: string): Promise<Buffer | null> {
	const obj = await getObject(key);
	if (obj === null || obj === 'not-modified') return null;
	const chunks: Uint8Array[] = [];
	const reader = obj.body.getReader();
	for (;;) {
		const { done, value } = await reader.read();
		if (done) break;
		chunks.push(value);
	}
	return Buffer.concat(chunks);
}

/** Delete the given keys (missing keys are fine), 1000 per request as S3 allows. */
export async function deleteObjects(keys: readonly string[]): Promise<void> {
	for (let i = 0; i < keys.length; i += 1000) {
		const batch = keys.slice(i, i + 1000);
		const res = await s3().send(
			new DeleteObjectsCommand({
				Bucket: bucket(),
				Delete: { Objects: batch.map((Key) => ({ Key })), Quiet: true }
			})
		);
		const failed = (res.Errors ?? []).filter((e) => e.Code !== 'NoSuchKey');
		if (failed.length) {
			throw new Error(`Could not delete ${failed.length} object(s): ${failed.map((e) => e.Key).join(', ')}`);
		}
	}
}

/** Every key under `prefix` (follows pagination). */
export async function listKeys(prefix: string): Promise<string[]> {
	const keys: string[] = [];
	let token: string | undefined;
	do {
		const res = await s3().send(
			new ListObjectsV2Command({ Bucket: bucket(), Prefix: prefix, ContinuationToken: token })
		);
		for (const o of res.Contents ?? []) if (o.Key) keys.push(o.Key);
		token = res.IsTruncated ? res.NextContinuationToken : undefined;
	} while (token);
	return keys;
}

/** Create the bucket when it does not exist yet (local stores; hosted buckets are made by ops). */
export async function ensureBucket(): Promise<void> {
	try {
		await s3().send(new HeadBucketCommand({ Bucket: bucket() }));
	} catch (err) {
		if (!isMissing(err)) throw err;
		await s3().send(new CreateBucketCommand({ Bucket: bucket() }));
	}
}
