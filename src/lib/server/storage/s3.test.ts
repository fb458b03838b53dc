// The S3 store against s3rver, a stand-in S3 server from npm started by this test on a free port
// with a temporary folder; the same behaviours the local store promises (see local.test.ts).
import { mkdtemp, rm } from 'node:fs/promises';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import S3rver from 's3rver';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { storageFromEnv } from './config';
import {
	StorageKeyError,
	StorageLimitError,
	StorageNotFoundError,
	type BlobStorage
} from './storage';
import { storageFromSettings } from './settings';

let dir: string;
let server: S3rver;
let env: Record<string, string>;
let storage: BlobStorage;

beforeAll(async () => {
	dir = await mkdtemp(join(tmpdir(), 'fw-s3rver-'));
	server = new S3rver({
		port: 0,
		address: '127.0.0.1',
		silent: true,
		directory: dir,
		configureBuckets: [{ name: 'fw-test', configs: [] }]
	});
	const address = (await server.run()) as AddressInfo;
	env = {
		STORAGE_DRIVER: 's3',
		S3_ENDPOINT: `http://127.0.0.1:${address.port}`,
		S3_BUCKET: 'fw-test',
		S3_REGION: 'us-east-1',
		// s3rver's documented fixed credentials.
		S3_ACCESS_KEY_ID: 'S3RVER',
		S3_SECRET_ACCESS_KEY: 'S3RVER',
		S3_FORCE_PATH_STYLE: '1'
	};
	storage = storageFromEnv(env, 40 * 1024 * 1024);
}, 30_000);

afterAll(async () => {
	await server?.close();
	await rm(dir, { recursive: true, force: true });
});

const bytes = (n: number, seed = 1) => {
	const out = new Uint8Array(n);
	for (let i = 0; i < n; i++) out[i] = (i * 31 + seed) & 0xff;
	return out;
};

const sameBytes = (a: Uint8Array, b: Uint8Array) => Buffer.compare(a, b) === 0;

async function* chunked(total: number, chunk: number, seed = 1): AsyncGenerator<Uint8Array> {
	const all = bytes(total, seed);
	for (let at = 0; at < total; at += chunk) yield all.subarray(at, Math.min(total, at + chunk));
}

describe('S3 storage (against the s3rver stand-in)', () => {
	it('stores a small stream in one request and gives the same bytes back, as bytes and as a stream', async () => {
		const { size } = await storage.put('captures/w1/small.csv', chunked(7001, 1000));
		expect(size).toBe(7001);
		expect(await storage.exists('captures/w1/small.csv')).toBe(true);
		expect(await storage.getBytes('captures/w1/small.csv')).toEqual(bytes(7001));
		const streamed = new Uint8Array(
			await new Response(await storage.get('captures/w1/small.csv')).arrayBuffer()
		);
		expect(streamed).toEqual(bytes(7001));
	});

	it('streams a large source as a multipart upload (parts of 8 MiB) and reports progress', async () => {
		const total = 17 * 1024 * 1024 + 123;
		const progress: number[] = [];
		const { size } = await storage.put('captures/w1/large.csv', chunked(total, 65536, 7), {
			onProgress: (n) => progress.push(n)
		});
		expect(size).toBe(total);
		expect(progress.at(-1)).toBe(total);
		expect(progress.length).toBe(3); // three parts: 8 MiB, 8 MiB, the rest
		// Compared as one boolean: a deep equality walks every index of a 17 MiB array.
		expect(sameBytes(await storage.getBytes('captures/w1/large.csv'), bytes(total, 7))).toBe(true);
	}, 60_000);

	it('aborts an upload over the limit: clear error, nothing stored, earlier content kept', async () => {
		await storage.put('captures/w1/keep.csv', chunked(10, 10, 3));
		const failure = storage.put('captures/w1/keep.csv', chunked(20 * 1024 * 1024, 1 << 20), {
			maxBytes: 9 * 1024 * 1024
		});
		await expect(failure).rejects.toBeInstanceOf(StorageLimitError);
		await expect(failure).rejects.toThrow('larger than the limit of 9 MiB; nothing was stored');
		expect(await storage.getBytes('captures/w1/keep.csv')).toEqual(bytes(10, 3));
		await expect(
			storage.put('captures/w1/none.csv', chunked(20, 20), { maxBytes: 19 })
		).rejects.toBeInstanceOf(StorageLimitError);
		expect(await storage.exists('captures/w1/none.csv')).toBe(false);
	}, 60_000);

	it('deletes, tolerates deleting a missing key, reports a missing key, refuses bad keys', async () => {
		await storage.put('x/y.bin', chunked(3, 3));
		await storage.delete('x/y.bin');
		expect(await storage.exists('x/y.bin')).toBe(false);
		await expect(storage.delete('x/y.bin')).resolves.toBeUndefined();
		await expect(storage.get('x/y.bin')).rejects.toBeInstanceOf(StorageNotFoundError);
		await expect(storage.getBytes('nope')).rejects.toThrow('nothing is stored under "nope"');
		await expect(storage.put('../outside', chunked(1, 1))).rejects.toBeInstanceOf(StorageKeyError);
		await expect(storage.exists('/etc/passwd')).rejects.toBeInstanceOf(StorageKeyError);
	});

	it('refuses incomplete S3 settings with the variable named', () => {
		expect(() => storageFromEnv({ STORAGE_DRIVER: 's3' })).toThrow(/S3_BUCKET is required/);
		expect(() => storageFromEnv({ STORAGE_DRIVER: 'ftp' })).toThrow(
			/STORAGE_DRIVER is "local" or "s3"/
		);
		expect(() => storageFromEnv({ ...env, S3_ENDPOINT: 'not a url' })).toThrow(
			/S3_ENDPOINT must be a URL/
		);
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
