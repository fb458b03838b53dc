/**
 * The one small interface every blob store implements (captures, their compact stored form):
 * the local filesystem by default; object storage can implement the same contract.
 */
import { z } from 'zod';

/**
 * Keys are `/`-separated segments of letters, digits, `.`, `_` and `-`, each starting with a letter
 * or digit, so no key can climb out of the store (`..`), be absolute, or hide as a dot file.
 */
export const storageKeySchema = z
	.string()
	.min(1, 'the storage key is empty')
	.max(512, 'the storage key is longer than 512 characters')
	.regex(
		/^[A-Za-z0-9][A-Za-z0-9._-]*(\/[A-Za-z0-9][A-Za-z0-9._-]*)*$/,
		'the storage key must be "/"-separated parts of letters, digits, ".", "_" and "-", each starting with a letter or digit'
	);
export type StorageKey = z.infer<typeof storageKeySchema>;

export type ByteSource = ReadableStream<Uint8Array> | AsyncIterable<Uint8Array>;

export interface PutOptions {
	/** Refuse a stream longer than this many bytes (the store's own limit when absent). */
	maxBytes?: number;
	/** Called after each chunk is written, for progress reports. */
	onProgress?: (bytesWritten: number) => void;
}

/**
 * How to open the same store again in another thread (a capture worker) or process: plain data,
 * passed through structured clone; `storageFromSettings` (settings.ts) turns it back into a store.
 */
export type StorageSettings =
	| { driver: 'local'; root: string; maxBytes: number }
	| {
			driver: 's3';
			bucket: string;
			region: string;
			endpoint?: string;
			accessKeyId?: string;
			secretAccessKey?: string;
			forcePathStyle?: boolean;
			prefix?: string;
			maxBytes?: number;
	  };

export interface BlobStorage {
	readonly settings: StorageSettings;
	/** Streams `source` to `key`; the key appears only when the whole stream arrived (nothing on failure). */
	put(key: string, source: ByteSource, options?: PutOptions): Promise<{ size: number }>;
	/** The stored bytes as a stream; StorageNotFoundError when there is no such key. */
	get(key: string): Promise<ReadableStream<Uint8Array>>;
	getBytes(key: string): Promise<Uint8Array>;
	/** `length` bytes from `offset` (fewer at the end of the blob); StorageNotFoundError when missing. */
	getRange(key: string, offset: number, length: number): Promise<Uint8Array>;
	/** Removes the key; removing a missing key is not an error. */
	delete(key: string): Promise<void>;
	exists(key: string): Promise<boolean>;
	/** Every key under `prefix` (a folder ending in "/", or "" for all), sorted. */
	list(prefix: string): Promise<string[]>;
	/** Removes every key under `prefix` (a folder ending in "/"); returns how many. */
	deletePrefix(prefix: string): Promise<number>;
	/**
	 * Removes what interrupted puts left behind (local temporary files, S3 multipart uploads) that
	 * saw no write for `idleMs`; returns how many.
	 */
	sweepIncomplete(idleMs: number): Promise<number>;
}

/** A folder prefix for list/deletePrefix: empty, or key parts ending in "/". */
export function checkPrefix(prefix: string): string {
	if (prefix === '') return prefix;
	if (!prefix.endsWith('/'))
		throw new StorageKeyError(`a storage prefix must end in "/": ${prefix}`);
	checkStorageKey(prefix.slice(0, -1));
	return prefix;
}

export class StorageKeyError extends Error {
	override name = 'StorageKeyError';
}

export class StorageNotFoundError extends Error {
	override name = 'StorageNotFoundError';
}

/** The stream was longer than allowed; nothing was kept. */
export class StorageLimitError extends Error {
	override name = 'StorageLimitError';
	constructor(readonly maxBytes: number) {
		super(`the upload is larger than the limit of ${formatBytes(maxBytes)}; nothing was stored`);
	}
}

export function formatBytes(n: number): string {
	const units = ['bytes', 'KiB', 'MiB', 'GiB', 'TiB'];
	let value = n;
	let u = 0;
	while (value >= 1024 && u < units.length - 1) {
		value /= 1024;
		u++;
	}
	return u === 0 ? `${n} bytes` : `${Number(value.toPrecision(3))} ${units[u]}`;
}

/** The key, checked; StorageKeyError names what is wrong. */
export function checkStorageKey(key: unknown): StorageKey {
	const parsed = storageKeySchema.safeParse(key);
	if (parsed.success) return parsed.data;
	throw new StorageKeyError(
		`bad storage key ${JSON.stringify(key)}: ${parsed.error.issues.map((i) => i.message).join('; ')}`
	);
}

/** Reads any byte source chunk by chunk; cancels a web stream that is left early (limit, error). */
export async function* byteChunks(source: ByteSource): AsyncGenerator<Uint8Array> {
	if (typeof (source as ReadableStream).getReader !== 'function') {
		yield* source as AsyncIterable<Uint8Array>;
		return;
	}
	const reader = (source as ReadableStream<Uint8Array>).getReader();
	let finished = false;
	try {
		for (;;) {
			const { done, value } = await reader.read();
			if (done) {
				finished = true;
				return;
			}
			yield value;
		}
	} finally {
		if (!finished) await reader.cancel().catch(() => {});
		reader.releaseLock();
	}
}
