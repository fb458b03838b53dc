/**
 * BlobStorage on the local filesystem under one root folder (default `data/storage`). A put streams
 * into a temporary file in the root's `.incoming/` folder, flushes it to disk and renames it into
 * place, so a key holds either its old content or the complete new one — never a partial upload.
 */
import { randomUUID } from 'node:crypto';
import { mkdir, open, readdir, readFile, rename, rm, stat } from 'node:fs/promises';
import { dirname, join, resolve, sep } from 'node:path';
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

export interface LocalStorageOptions {
	/** Folder holding the blobs (created when missing). */
	root?: string;
	/** Largest blob a put accepts unless it asks for less; 1 GiB by default (issue 5's upload limit). */
	maxBytes?: number;
}

export const DEFAULT_STORAGE_ROOT = 'data/storage';
export const DEFAULT_MAX_BYTES = 1024 ** 3;
/** Bytes read from disk per chunk of a `get` stream. */
const READ_CHUNK_BYTES = 1 << 16;
/** Temporary files live inside the root (same filesystem, so the rename is atomic); keys cannot start with a dot. */
const INCOMING = '.incoming';

function isNotFound(error: unknown): boolean {
	return (error as NodeJS.ErrnoException | null)?.code === 'ENOENT';
}

export function createLocalStorage(options: LocalStorageOptions = {}): BlobStorage {
	const root = resolve(options.root ?? DEFAULT_STORAGE_ROOT);
	const storeMax = options.maxBytes ?? DEFAULT_MAX_BYTES;

	/** The file of a key; the key schema already refuses `..`, and this double-checks the result stays inside. */
	const pathOf = (key: string): string => {
		const path = resolve(root, checkStorageKey(key));
		if (!path.startsWith(root + sep))
			throw new Error(`storage key ${JSON.stringify(key)} resolves outside the store`);
		return path;
	};

	const notFound = (key: string) => new StorageNotFoundError(`nothing is stored under "${key}"`);

	/** Files under a folder of the root, as keys (the temporary folder is not part of any key). */
	async function walk(folder: string, prefix: string, out: string[]): Promise<void> {
		let entries;
		try {
			entries = await readdir(folder, { withFileTypes: true });
		} catch (error) {
			if (isNotFound(error)) return;
			throw error;
		}
		for (const entry of entries) {
			if (entry.name === INCOMING && prefix === '') continue;
			if (entry.isDirectory()) await walk(join(folder, entry.name), `${prefix}${entry.name}/`, out);
			else if (entry.isFile()) out.push(prefix + entry.name);
		}
	}

	return {
		settings: { driver: 'local', root, maxBytes: storeMax },

		async put(key: string, source: ByteSource, putOptions: PutOptions = {}) {
			const target = pathOf(key);
			const maxBytes = Math.min(putOptions.maxBytes ?? storeMax, storeMax);
			const incoming = join(root, INCOMING);
			await mkdir(incoming, { recursive: true });
			const temp = join(incoming, `${randomUUID()}.part`);
			const file = await open(temp, 'wx');
			let size = 0;
			let closed = false;
			try {
				for await (const chunk of byteChunks(source)) {
					size += chunk.byteLength;
					if (size > maxBytes) throw new StorageLimitError(maxBytes);
					await file.write(chunk);
					putOptions.onProgress?.(size);
				}
				await file.sync(); // on disk before the rename makes it visible
				await file.close();
				closed = true;
				await mkdir(dirname(target), { recursive: true });
				await rename(temp, target);
				return { size };
			} catch (error) {
				if (!closed) await file.close().catch(() => {});
				await rm(temp, { force: true });
				throw error;
			}
		},

		async get(key: string) {
			const path = pathOf(key);
			const file = await open(path, 'r').catch((error: unknown) => {
				throw isNotFound(error) ? notFound(key) : error;
			});
			// Pulled chunk by chunk, so a slow reader never makes the whole file sit in memory.
			return new ReadableStream<Uint8Array>({
				async pull(controller) {
					try {
						const buffer = new Uint8Array(READ_CHUNK_BYTES);
						const { bytesRead } = await file.read(buffer, 0, READ_CHUNK_BYTES, null);
						if (bytesRead === 0) {
							await file.close();
							controller.close();
						} else controller.enqueue(buffer.subarray(0, bytesRead));
					} catch (error) {
						await file.close().catch(() => {});
						controller.error(error);
					}
				},
				async cancel() {
					await file.close();
				}
			});
		},

		async getBytes(key: string) {
			try {
				const bytes = await readFile(pathOf(key));
				return new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.byteLength); // a plain view, no copy
			} catch (error) {
				throw isNotFound(error) ? notFound(key) : error;
			}
		},

		async getRange(key: string, offset: number, length: number) {
			const file = await open(pathOf(key), 'r').catch((error: unknown) => {
				throw isNotFound(error) ? notFound(key) : error;
			});
			try {
				const buffer = new Uint8Array(length);
				let read = 0;
				while (read < length) {
					const { bytesRead } = await file.read(buffer, read, length - read, offset + read);
					if (bytesRead === 0) break;
					read += bytesRead;
				}
				return buffer.subarray(0, read);
			} finally {
				await file.close();
			}
		},

		async delete(key: string) {
			await rm(pathOf(key), { force: true });
		},

		async list(prefix: string) {
			checkPrefix(prefix);
			const out: string[] = [];
			await walk(prefix ? pathOf(prefix.slice(0, -1)) : root, prefix, out);
			return out.sort();
		},

		async deletePrefix(prefix: string) {
			if (checkPrefix(prefix) === '') throw new Error('refusing to delete the whole store');
			const keys: string[] = [];
			const folder = pathOf(prefix.slice(0, -1));
			await walk(folder, prefix, keys);
			await rm(folder, { recursive: true, force: true });
			return keys.length;
		},

		async sweepIncomplete(idleMs: number) {
			const incoming = join(root, INCOMING);
			let names: string[];
			try {
				names = await readdir(incoming);
			} catch (error) {
				if (isNotFound(error)) return 0;
				throw error;
			}
			let removed = 0;
			for (const name of names) {
				if (!name.endsWith('.part')) continue;
				const path = join(incoming, name);
				try {
					if (Date.now() - (await stat(path)).mtimeMs < idleMs) continue;
					await rm(path, { force: true });
					removed++;
				} catch (error) {
					if (!isNotFound(error)) throw error; // finished (renamed) meanwhile: not ours to count
				}
			}
			return removed;
		},

		async exists(key: string) {
			try {
				return (await stat(pathOf(key))).isFile();
			} catch (error) {
				if (isNotFound(error)) return false;
				throw error;
			}
		}
	};
}
