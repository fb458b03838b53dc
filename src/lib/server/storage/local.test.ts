import { mkdtemp, readdir, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { createLocalStorage } from './local';
import {
	StorageKeyError,
	StorageLimitError,
	StorageNotFoundError,
	type BlobStorage
} from './storage';
import { storageFromSettings } from './settings';

let root: string;
let storage: BlobStorage;

beforeEach(async () => {
	root = await mkdtemp(join(tmpdir(), 'fw-storage-'));
	storage = createLocalStorage({ root: join(root, 'store'), maxBytes: 10_000 });
});
afterEach(async () => {
	await rm(root, { recursive: true, force: true });
});

const bytes = (n: number, seed = 1) =>
	Uint8Array.from({ length: n }, (_, i) => (i * 31 + seed) & 0xff);

/** A web stream of the given chunks that records whether it was cancelled. */
function webStream(chunks: Uint8Array[]) {
	const state = { cancelled: false };
	let at = 0;
	const stream = new ReadableStream<Uint8Array>({
		pull(controller) {
			if (at < chunks.length) controller.enqueue(chunks[at++]);
			else controller.close();
		},
		cancel() {
			state.cancelled = true;
		}
	});
	return { stream, state };
}

async function* failingSource(): AsyncGenerator<Uint8Array> {
	yield bytes(1000);
	yield bytes(1000);
	throw new Error('connection reset by the client');
}

/** Files left anywhere under the store (temporary files included). */
async function filesUnder(dir: string): Promise<string[]> {
	const entries = await readdir(dir, { recursive: true, withFileTypes: true }).catch(() => []);
	return entries.filter((e) => e.isFile()).map((e) => join(e.parentPath, e.name));
}

describe('local storage', () => {
	it('stores a stream and gives the same bytes back, as bytes and as a stream', async () => {
		const chunks = [bytes(3000, 1), bytes(1, 2), bytes(4000, 3)];
		const { size } = await storage.put('captures/w1/c1.csv', webStream(chunks).stream);
		const expected = new Uint8Array(await new Blob(chunks).arrayBuffer());
		expect(size).toBe(7001);
		expect(await storage.exists('captures/w1/c1.csv')).toBe(true);
		expect(await storage.getBytes('captures/w1/c1.csv')).toEqual(expected);
		const streamed = new Uint8Array(
			await new Response(await storage.get('captures/w1/c1.csv')).arrayBuffer()
		);
		expect(streamed).toEqual(expected);
	});

	it('accepts an async iterable, reports progress, and replaces a key on a second put', async () => {
		async function* source() {
			yield bytes(10, 1);
			yield bytes(20, 2);
		}
		const progress: number[] = [];
		await storage.put('a.bin', source(), { onProgress: (n) => progress.push(n) });
		expect(progress).toEqual([10, 30]);
		await storage.put('a.bin', webStream([bytes(5, 9)]).stream);
		expect(await storage.getBytes('a.bin')).toEqual(bytes(5, 9));
	});

	it('leaves nothing behind when the stream fails, and keeps the earlier content of the key', async () => {
		await expect(storage.put('c.csv', failingSource())).rejects.toThrow(
			'connection reset by the client'
		);
		expect(await storage.exists('c.csv')).toBe(false);
		expect(await filesUnder(root)).toEqual([]);

		await storage.put('c.csv', webStream([bytes(7)]).stream);
		await expect(storage.put('c.csv', failingSource())).rejects.toThrow('connection reset');
		expect(await storage.getBytes('c.csv')).toEqual(bytes(7));
		expect((await filesUnder(root)).length).toBe(1);
	});

	it('aborts a stream over the size limit with a clear error, deletes the partial file and cancels the source', async () => {
		const { stream, state } = webStream([bytes(1000), bytes(1000), bytes(1000), bytes(1000)]);
		const failure = storage.put('big.csv', stream, { maxBytes: 2500 });
		await expect(failure).rejects.toBeInstanceOf(StorageLimitError);
		await expect(failure).rejects.toThrow(
			'the upload is larger than the limit of 2.44 KiB; nothing was stored'
		);
		expect(state.cancelled).toBe(true);
		expect(await storage.exists('big.csv')).toBe(false);
		expect(await filesUnder(root)).toEqual([]);
		// Exactly at the limit is allowed; the store's own limit caps a larger per-put request.
		expect(
			(await storage.put('edge.csv', webStream([bytes(2500)]).stream, { maxBytes: 2500 })).size
		).toBe(2500);
		await expect(
			storage.put('huge.csv', webStream([bytes(10_001)]).stream, { maxBytes: 1e9 })
		).rejects.toBeInstanceOf(StorageLimitError);
	});

	it('deletes, tolerates deleting a missing key, and reports a missing key on read', async () => {
		await storage.put('x/y.bin', webStream([bytes(3)]).stream);
		await storage.delete('x/y.bin');
		expect(await storage.exists('x/y.bin')).toBe(false);
		await expect(storage.delete('x/y.bin')).resolves.toBeUndefined();
		await expect(storage.get('x/y.bin')).rejects.toBeInstanceOf(StorageNotFoundError);
		await expect(storage.getBytes('nope')).rejects.toThrow('nothing is stored under "nope"');
		expect(await storage.exists('x')).toBe(false); // a folder is not a blob
	});

	it.each([
		'../outside',
		'a/../../outside',
		'/etc/passwd',
		'.incoming/x',
		'a//b',
		'a/',
		'a\\..\\b',
		'C:evil',
		'',
		'a/./b',
		'x'.repeat(513)
	])('refuses the key %j on every operation', async (key) => {
		await expect(storage.put(key, webStream([bytes(1)]).stream)).rejects.toBeInstanceOf(
			StorageKeyError
		);
		await expect(storage.get(key)).rejects.toBeInstanceOf(StorageKeyError);
		await expect(storage.getBytes(key)).rejects.toBeInstanceOf(StorageKeyError);
		await expect(storage.exists(key)).rejects.toBeInstanceOf(StorageKeyError);
		await expect(storage.delete(key)).rejects.toBeInstanceOf(StorageKeyError);
		expect(await filesUnder(root)).toEqual([]);
	});
	it('reads byte ranges, lists and deletes by folder, and reopens from its settings', async () => {
		const data = bytes(5000, 3);
		async function* one(b: Uint8Array) {
			yield b;
		}
		await storage.put('w1/c1/raw.csv', one(data));
		await storage.put('w1/c1/store/a.bin', one(bytes(10)));
		await storage.put('w1/c2/raw.csv', one(bytes(10)));
		await storage.put('w2/c3/raw.csv', one(bytes(10)));
		expect(Array.from(await storage.getRange('w1/c1/raw.csv', 100, 50))).toEqual(
			Array.from(data.subarray(100, 150))
		);
		expect((await storage.getRange('w1/c1/raw.csv', 4990, 50)).length).toBe(10); // cut at the end
		await expect(storage.getRange('w1/none', 0, 5)).rejects.toBeInstanceOf(StorageNotFoundError);
		expect(await storage.list('w1/')).toEqual([
			'w1/c1/raw.csv',
			'w1/c1/store/a.bin',
			'w1/c2/raw.csv'
		]);
		expect(await storage.list('w9/')).toEqual([]);
		expect(await storage.deletePrefix('w1/c1/')).toBe(2);
		expect(await storage.list('w1/')).toEqual(['w1/c2/raw.csv']);
		expect(await storage.list('w2/')).toEqual(['w2/c3/raw.csv']);
		await expect(storage.deletePrefix('')).rejects.toThrow(/whole store/);
		await expect(storage.list('w1')).rejects.toBeInstanceOf(StorageKeyError);
		const again = await storageFromSettings(structuredClone(storage.settings));
		expect(Array.from(await again.getBytes('w2/c3/raw.csv'))).toEqual(Array.from(bytes(10)));
	});
});

describe('sweeping interrupted puts', () => {
	it('removes temporary files idle for longer than asked, keeps fresh ones', async () => {
		const { utimes, writeFile, mkdir } = await import('node:fs/promises');
		const incoming = join(root, 'store', '.incoming');
		await mkdir(incoming, { recursive: true });
		await writeFile(join(incoming, 'old.part'), 'x');
		await writeFile(join(incoming, 'new.part'), 'x');
		const anHourAgo = new Date(Date.now() - 3600_000);
		await utimes(join(incoming, 'old.part'), anHourAgo, anHourAgo);
		expect(await storage.sweepIncomplete(60_000)).toBe(1);
		expect(await readdir(incoming)).toEqual(['new.part']);
		expect(await storage.list('')).toEqual([]); // temporary files are never keys
		expect(await storage.sweepIncomplete(0)).toBe(1);
	});
});
