/**
 * gzip-compressed captures (docs/capture-csv.md, "Compressed files"): told apart by the gzip magic
 * bytes 1f 8b (RFC 1952, section 2.3.1), not by the file name, and decompressed while streaming with
 * Node's zlib — never whole in memory. The decompressed size is bounded like the upload itself, so a
 * small file that inflates past the limit (a decompression bomb) is stopped as soon as it passes it.
 */
import { once } from 'node:events';
import { Readable } from 'node:stream';
import { createGunzip } from 'node:zlib';
import { formatBytes } from '../storage/storage';

/** True when the bytes start with the gzip magic number 1f 8b (RFC 1952, 2.3.1). */
export const isGzip = (bytes: Uint8Array) =>
	bytes.byteLength >= 2 && bytes[0] === 0x1f && bytes[1] === 0x8b;

/** The decompressed text passed the limit: the file is refused whatever its compressed size. */
export class InflatedTooLargeError extends Error {
	constructor(readonly maxBytes: number) {
		super(
			`The compressed file decompresses to more than the upload limit of ${formatBytes(maxBytes)}; nothing was stored.`
		);
	}
}

/** The compressed data is damaged or cut short. */
export class GzipFormatError extends Error {}

function isZlibError(error: unknown): error is Error & { code: string } {
	const code: unknown = (error as { code?: unknown } | null)?.code;
	return error instanceof Error && typeof code === 'string' && code.startsWith('Z_');
}

/** A zlib failure as a message a person can act on. */
function gzipProblem(error: Error & { code: string }): GzipFormatError {
	const truncated = error.code === 'Z_BUF_ERROR' || /unexpected end/i.test(error.message);
	return new GzipFormatError(
		truncated
			? 'The gzip-compressed file ends too early (it was cut short, e.g. by an interrupted download); compress or copy it again.'
			: `The gzip-compressed file is damaged (${error.message}); compress it again from the original capture.`
	);
}

/**
 * Decompresses while the compressed bytes are written to it (the upload tees them here on their
 * way to storage): `onData` gets the decompressed chunks; `write` and `end` throw the first
 * failure — InflatedTooLargeError past `maxBytes`, GzipFormatError for damaged data.
 */
export function gunzipTap(maxBytes: number, onData: (chunk: Uint8Array) => void) {
	const z = createGunzip();
	let failure: Error | null = null;
	let total = 0;
	z.on('data', (chunk: Buffer) => {
		if (failure) return;
		total += chunk.byteLength;
		if (total > maxBytes) {
			failure = new InflatedTooLargeError(maxBytes);
			z.destroy();
			return;
		}
		onData(chunk);
	});
	z.on('error', (error) => {
		failure ??= isZlibError(error) ? gzipProblem(error) : error;
	});
	const closed = once(z, 'close').then(
		() => {},
		() => {}
	);
	const check = () => {
		if (failure) throw failure;
	};
	return {
		async write(chunk: Uint8Array): Promise<void> {
			check();
			if (!z.write(chunk)) await Promise.race([once(z, 'drain').catch(() => {}), closed]);
			check();
		},
		/** Flushes; resolves to the decompressed size. */
		async end(): Promise<number> {
			check();
			z.end();
			await closed;
			check();
			return total;
		},
		destroy: () => z.destroy()
	};
}

/** Decompresses a stream of gzip bytes as it is read (pulled: no more is read than is used). */
export async function* gunzipChunks(
	source: AsyncIterable<Uint8Array>,
	maxBytes = Number.POSITIVE_INFINITY
): AsyncGenerator<Uint8Array> {
	const z = createGunzip();
	const input = Readable.from(source, { objectMode: false });
	input.on('error', (error) => z.destroy(error));
	input.pipe(z);
	let total = 0;
	try {
		for await (const chunk of z as AsyncIterable<Buffer>) {
			total += chunk.byteLength;
			if (total > maxBytes) throw new InflatedTooLargeError(maxBytes);
			yield chunk;
		}
	} catch (error) {
		throw isZlibError(error) ? gzipProblem(error) : error;
	} finally {
		input.destroy();
		z.destroy();
	}
}

/**
 * The first chunks of a byte stream, read until the gzip magic can be told (two bytes), and the
 * whole stream again with them in front.
 */
export async function peekMagic(
	source: AsyncIterable<Uint8Array>
): Promise<{ gzip: boolean; chunks: AsyncGenerator<Uint8Array> }> {
	const iterator = source[Symbol.asyncIterator]();
	const early: Uint8Array[] = [];
	let seen = 0;
	let done = false;
	while (seen < 2) {
		const next = await iterator.next();
		if (next.done) {
			done = true;
			break;
		}
		early.push(next.value);
		seen += next.value.byteLength;
	}
	const first = new Uint8Array(Math.min(seen, 2));
	let at = 0;
	for (const c of early) {
		if (at >= first.length) break;
		const part = c.subarray(0, first.length - at);
		first.set(part, at);
		at += part.byteLength;
	}
	async function* chunks(): AsyncGenerator<Uint8Array> {
		try {
			yield* early;
			if (done) return;
			for (;;) {
				const next = await iterator.next();
				if (next.done) return;
				yield next.value;
			}
		} finally {
			await iterator.return?.();
		}
	}
	return { gzip: isGzip(first), chunks: chunks() };
}

/** The stream as text bytes: decompressed when it is gzip, passed through otherwise. */
export async function* plainBytes(
	source: AsyncIterable<Uint8Array>,
	maxBytes?: number
): AsyncGenerator<Uint8Array> {
	const { gzip, chunks } = await peekMagic(source);
	yield* gzip ? gunzipChunks(chunks, maxBytes) : chunks;
}
