/**
 * BlobStorage on S3-compatible object storage through the AWS SDK. A put streams the source as a
 * multipart upload (parts of PART_BYTES, so memory holds one part, never the whole file); the
 * object only becomes visible when the upload completes, and a failed or over-limit upload is
 * aborted, so a key holds either its old content or the complete new one — as in the local store.
 */
import {
	AbortMultipartUploadCommand,
	CompleteMultipartUploadCommand,
	CreateMultipartUploadCommand,
	DeleteObjectCommand,
	DeleteObjectsCommand,
	GetObjectCommand,
	HeadObjectCommand,
	ListMultipartUploadsCommand,
	ListObjectsV2Command,
	PutObjectCommand,
	S3Client,
	UploadPartCommand,
	type CompletedPart
} from '@aws-sdk/client-s3';
import {
	byteChunks,
	checkPrefix,
	checkStorageKey,
	StorageLimitError,
	StorageNotFoundError,
	type BlobStorage,
	type ByteSource,
	type PutOptions
} from './storage';

export interface S3StorageOptions {
	bucket: string;
	region: string;
	/** An S3-compatible service's address; absent for AWS itself. */
	endpoint?: string;
	accessKeyId?: string;
	secretAccessKey?: string;
	/** `http://host/bucket/key` instead of `http://bucket.host/key` (most self-hosted services need it). */
	forcePathStyle?: boolean;
	/** Optional prefix inside the bucket, e.g. `framewright/`. */
	prefix?: string;
	maxBytes?: number;
}

/** Every part but the last must be at least 5 MiB (S3 multipart upload rules). */
const PART_BYTES = 8 * 1024 * 1024;

function isNotFound(error: unknown): boolean {
	const e = error as { name?: string; $metadata?: { httpStatusCode?: number } } | null;
	return e?.name === 'NoSuchKey' || e?.name === 'NotFound' || e?.$metadata?.httpStatusCode === 404;
}

/** Re-cuts a byte source into parts of exactly `size` bytes (the last may be shorter). */
async function* parts(
	source: ByteSource,
	size: number,
	onChunk: (n: number) => void
): AsyncGenerator<Uint8Array> {
	let buffer = new Uint8Array(size);
	let filled = 0;
	for await (const chunk of byteChunks(source)) {
		onChunk(chunk.byteLength);
		let at = 0;
		while (at < chunk.byteLength) {
			const n = Math.min(size - filled, chunk.byteLength - at);
			buffer.set(chunk.subarray(at, at + n), filled);
			filled += n;
			at += n;
			if (filled === size) {
				yield buffer;
				buffer = new Uint8Array(size);
				filled = 0;
			}
		}
	}
	if (filled > 0) yield buffer.subarray(0, filled);
}

export function createS3Storage(options: S3StorageOptions): BlobStorage {
	const client = new S3Client({
		region: options.region,
		endpoint: options.endpoint,
		forcePathStyle: options.forcePathStyle,
		credentials:
			options.accessKeyId && options.secretAccessKey
				? { accessKeyId: options.accessKeyId, secretAccessKey: options.secretAccessKey }
				: undefined
	});
	const Bucket = options.bucket;
	const prefix = options.prefix ?? '';
	const storeMax = options.maxBytes ?? 1024 ** 3;
	const objectKey = (key: string) => prefix + checkStorageKey(key);
	const notFound = (key: string) => new StorageNotFoundError(`nothing is stored under "${key}"`);

	async function getBody(key: string) {
		try {
			const out = await client.send(new GetObjectCommand({ Bucket, Key: objectKey(key) }));
			if (!out.Body) throw notFound(key);
			return out.Body;
		} catch (error) {
			throw isNotFound(error) ? notFound(key) : error;
		}
	}

	/** Every object key under `prefix` (inside our own prefix), as storage keys. */
	async function listKeys(prefix: string): Promise<string[]> {
		const keys: string[] = [];
		let ContinuationToken: string | undefined;
		do {
			const page = await client.send(
				new ListObjectsV2Command({ Bucket, Prefix: prefix_ + prefix, ContinuationToken })
			);
			for (const o of page.Contents ?? []) if (o.Key) keys.push(o.Key.slice(prefix_.length));
			ContinuationToken = page.IsTruncated ? page.NextContinuationToken : undefined;
		} while (ContinuationToken);
		return keys.sort();
	}
	const prefix_ = prefix;

	return {
		settings: {
			driver: 's3',
			bucket: options.bucket,
			region: options.region,
			endpoint: options.endpoint,
			accessKeyId: options.accessKeyId,
			secretAccessKey: options.secretAccessKey,
			forcePathStyle: options.forcePathStyle,
			prefix,
			maxBytes: storeMax
		},

		async put(key: string, source: ByteSource, putOptions: PutOptions = {}) {
			const Key = objectKey(key);
			const maxBytes = Math.min(putOptions.maxBytes ?? storeMax, storeMax);
			let size = 0;
			const counted = (n: number) => {
				size += n;
				if (size > maxBytes) throw new StorageLimitError(maxBytes);
			};
			const iterator = parts(source, PART_BYTES, counted);
			const first = await iterator.next();
			const second = first.done ? first : await iterator.next();
			if (second.done) {
				// Small enough for one request.
				const body = first.done ? new Uint8Array(0) : first.value;
				await client.send(
					new PutObjectCommand({ Bucket, Key, Body: body, ContentLength: body.byteLength })
				);
				putOptions.onProgress?.(size);
				return { size };
			}
			const { UploadId } = await client.send(new CreateMultipartUploadCommand({ Bucket, Key }));
			const completed: CompletedPart[] = [];
			try {
				const send = async (body: Uint8Array) => {
					const PartNumber = completed.length + 1;
					const { ETag } = await client.send(
						new UploadPartCommand({
							Bucket,
							Key,
							UploadId,
							PartNumber,
							Body: body,
							ContentLength: body.byteLength
						})
					);
					completed.push({ ETag, PartNumber });
					putOptions.onProgress?.(size);
				};
				await send(first.value!);
				await send(second.value);
				for await (const part of iterator) await send(part);
				await client.send(
					new CompleteMultipartUploadCommand({
						Bucket,
						Key,
						UploadId,
						MultipartUpload: { Parts: completed }
					})
				);
				return { size };
			} catch (error) {
				await client
					.send(new AbortMultipartUploadCommand({ Bucket, Key, UploadId }))
					.catch(() => {});
				throw error;
			}
		},

		async get(key: string) {
			const body = await getBody(key);
			return body.transformToWebStream() as ReadableStream<Uint8Array>;
		},

		async getBytes(key: string) {
			return (await getBody(key)).transformToByteArray();
		},

		async getRange(key: string, offset: number, length: number) {
			if (length === 0) return new Uint8Array(0);
			try {
				const out = await client.send(
					new GetObjectCommand({
						Bucket,
						Key: objectKey(key),
						Range: `bytes=${offset}-${offset + length - 1}`
					})
				);
				if (!out.Body) throw notFound(key);
				return await out.Body.transformToByteArray();
			} catch (error) {
				throw isNotFound(error) ? notFound(key) : error;
			}
		},

		async delete(key: string) {
			await client.send(new DeleteObjectCommand({ Bucket, Key: objectKey(key) }));
		},

		async list(prefix: string) {
			return listKeys(checkPrefix(prefix));
		},

		async deletePrefix(prefix: string) {
			if (checkPrefix(prefix) === '') throw new Error('refusing to delete the whole store');
			const keys = await listKeys(prefix);
			// DeleteObjects takes at most 1000 keys a request (S3 API reference).
			for (let at = 0; at < keys.length; at += 1000) {
				await client.send(
					new DeleteObjectsCommand({
						Bucket,
						Delete: { Objects: keys.slice(at, at + 1000).map((k) => ({ Key: prefix_ + k })) }
					})
				);
			}
			return keys.length;
		},

		async sweepIncomplete(idleMs: number) {
			// Multipart uploads left open by a stopped server hold their parts (and cost) until aborted.
			let removed = 0;
			let KeyMarker: string | undefined;
			let UploadIdMarker: string | undefined;
			for (;;) {
				const page = await client.send(
					new ListMultipartUploadsCommand({ Bucket, Prefix: prefix_, KeyMarker, UploadIdMarker })
				);
				for (const u of page.Uploads ?? []) {
					if (!u.Key || !u.UploadId) continue;
					if (u.Initiated && Date.now() - u.Initiated.getTime() < idleMs) continue;
					await client
						.send(new AbortMultipartUploadCommand({ Bucket, Key: u.Key, UploadId: u.UploadId }))
						.then(() => removed++)
						.catch(() => {});
				}
				if (!page.IsTruncated) return removed;
				KeyMarker = page.NextKeyMarker;
				UploadIdMarker = page.NextUploadIdMarker;
			}
		},

		async exists(key: string) {
			try {
				await client.send(new HeadObjectCommand({ Bucket, Key: objectKey(key) }));
				return true;
			} catch (error) {
				if (isNotFound(error)) return false;
				throw error;
			}
		}
	};
}
