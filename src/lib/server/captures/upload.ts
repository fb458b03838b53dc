/**
 * Receives a capture upload: streams the request body straight to blob storage (never whole in
 * memory), keeping only the first bytes aside to check that the file is text and to guess its
 * column layout. A gzip-compressed file (gzip.ts) is stored compressed and decompressed beside on
 * its way, for those checks and to bound its decompressed size. Refusals are clear and leave nothing
 * stored: 413 over the size limit (from Content-Length up front, and while streaming, compressed or
 * decompressed), 415 for binary files, 400 for an empty body or damaged compressed data.
 */
import Papa from 'papaparse';
import type { DetectedLayout, UploadResponse } from '../../api/captures';
import { CaptureFormatError, detectCaptureLayout } from '../../can/capture/detect-layout';
import { Problem } from '../problem';
import type { Services } from '../services';
import { byteChunks, formatBytes, StorageLimitError } from '../storage/storage';
import { appendAudit } from '../workspaces/audit';
import { insertCapture, requireCaptureSummary } from './captures-db';
import { captureKeys } from './capture-store';
import { GzipFormatError, gunzipTap, InflatedTooLargeError, peekMagic } from './gzip';

/** Bytes kept aside for the layout guess. */
export const DETECTION_BYTES = 64 * 1024;
/** Bytes looked at to tell text from binary (a NUL or many control bytes means binary). */
const SNIFF_BYTES = 4096;
/** Rows shown in the confirmation preview. */
const PREVIEW_ROWS = 20;

export interface UploadInput {
	workspaceId: string;
	actorId: string;
	fileName: string;
	/** The request's Content-Length, when it sent one. */
	contentLength: number | null;
	body: ReadableStream<Uint8Array> | null;
}

class NotACaptureError extends Error {}

/**
 * Binary if it holds a NUL byte or more than 1 in 20 control bytes other than tab, CR, LF
 * (common practice for telling text files from binary ones, as text tools do).
 */
function looksBinary(bytes: Uint8Array): boolean {
	let control = 0;
	for (const b of bytes) {
		if (b === 0) return true;
		if (b < 32 && b !== 9 && b !== 10 && b !== 13) control++;
	}
	return control * 20 > bytes.length;
}

/** The first DETECTION_BYTES of the text, kept for the layout guess. */
interface Head {
	bytes: Uint8Array;
	length: number;
	sniffed: boolean;
}

/** Keeps the start of the text aside and refuses binary content as soon as enough is seen. */
function keepHead(head: Head, value: Uint8Array) {
	if (head.length < DETECTION_BYTES) {
		const n = Math.min(DETECTION_BYTES - head.length, value.byteLength);
		head.bytes.set(value.subarray(0, n), head.length);
		head.length += n;
	}
	if (!head.sniffed && head.length >= SNIFF_BYTES) {
		head.sniffed = true;
		if (looksBinary(head.bytes.subarray(0, SNIFF_BYTES))) throw new NotACaptureError();
	}
}

/**
 * Passes the stored bytes through, keeping the start of the text aside; a gzip upload goes on
 * compressed to storage while `tap` decompresses it beside (its size checked, its text kept).
 */
async function* tapped(
	body: AsyncIterable<Uint8Array>,
	head: Head,
	tap: ReturnType<typeof gunzipTap> | null,
	text: { size: number }
): AsyncGenerator<Uint8Array> {
	try {
		for await (const value of body) {
			if (tap) await tap.write(value);
			else {
				keepHead(head, value);
				text.size += value.byteLength;
			}
			yield value;
		}
		if (tap) text.size = await tap.end();
	} finally {
		tap?.destroy();
	}
	if (!head.sniffed && looksBinary(head.bytes.subarray(0, head.length)))
		throw new NotACaptureError();
}

/** The layout guess and a preview from the first bytes (cut at the last whole line unless that is all). */
export function detectFromHead(head: Uint8Array, complete: boolean): DetectedLayout {
	let text = new TextDecoder('utf-8').decode(head).replace(/^\ufeff/, '');
	if (!complete) {
		const cut = text.lastIndexOf('\n');
		if (cut > 0) text = text.slice(0, cut + 1);
	}
	const guess = detectCaptureLayout(text);
	const preview = Papa.parse<string[]>(text, {
		delimiter: guess.layout.delimiter,
		preview: PREVIEW_ROWS,
		skipEmptyLines: 'greedy'
	});
	return {
		layout: guess.layout,
		notes: guess.notes,
		problem: guess.problem,
		sampleRows: preview.data
	};
}

/** The request's Content-Length as a byte count, null when it sent none. */
export function readContentLength(headers: Headers): number | null {
	const header = headers.get('content-length');
	if (header === null) return null;
	const bytes = Number(header);
	if (!(Number.isInteger(bytes) && bytes >= 0))
		throw new Problem(400, 'The Content-Length header is not a byte count.');
	return bytes;
}

const refuseNotCapture = (detail: string) =>
	new Problem(
		415,
		`This file is not a capture Framewright can read: ${detail} Nothing was stored.`
	);

export async function receiveCaptureUpload(
	services: Pick<Services, 'db' | 'storage' | 'config'>,
	input: UploadInput
): Promise<UploadResponse> {
	const limit = services.config.captureMaxBytes;
	const tooLarge = () =>
		new Problem(
			413,
			`The file is larger than the upload limit of ${formatBytes(limit)}; nothing was stored.`,
			undefined,
			{ maxBytes: limit }
		);
	if (input.contentLength !== null && input.contentLength > limit) throw tooLarge();
	if (input.body === null || input.contentLength === 0)
		throw new Problem(400, 'The file is empty; there is nothing to upload.');

	const id = crypto.randomUUID();
	const keys = captureKeys(input.workspaceId, id);
	const head: Head = { bytes: new Uint8Array(DETECTION_BYTES), length: 0, sniffed: false };
	// Told by its first bytes, not its name; stored compressed as it came (less disk).
	const { gzip, chunks } = await peekMagic(byteChunks(input.body));
	const rawKey = gzip ? keys.rawGz : keys.raw;
	const tap = gzip ? gunzipTap(limit, (chunk) => keepHead(head, chunk)) : null;
	const text = { size: 0 };
	let size: number;
	try {
		({ size } = await services.storage.put(rawKey, tapped(chunks, head, tap, text), {
			maxBytes: limit
		}));
	} catch (error) {
		if (error instanceof StorageLimitError) throw tooLarge();
		if (error instanceof InflatedTooLargeError)
			throw new Problem(413, error.message, undefined, { maxBytes: limit });
		if (error instanceof GzipFormatError)
			throw new Problem(400, `${error.message} Nothing was stored.`);
		if (error instanceof NotACaptureError)
			throw refuseNotCapture(
				'it holds binary data, but captures are CSV text (time, ID, data per row).'
			);
		throw error;
	}
	if (size === 0 || text.size === 0) {
		await services.storage.delete(rawKey);
		throw new Problem(400, 'The file is empty; there is nothing to upload.');
	}

	let detected: DetectedLayout;
	try {
		detected = detectFromHead(head.bytes.subarray(0, head.length), head.length === text.size);
	} catch (error) {
		await services.storage.delete(rawKey);
		// Only a file without rows gets here: any text is kept for mapping by hand.
		if (error instanceof CaptureFormatError) throw new Problem(400, error.message);
		throw error;
	}

	try {
		await services.db.transaction().execute(async (trx) => {
			await insertCapture(trx, {
				id,
				workspaceId: input.workspaceId,
				fileName: input.fileName,
				sizeBytes: size,
				actorId: input.actorId,
				rawKey,
				detected,
				layout: null
			});
			await appendAudit(trx, {
				workspaceId: input.workspaceId,
				actorId: input.actorId,
				action: 'capture.upload',
				target: id,
				details: {
					fileName: input.fileName,
					sizeBytes: size,
					...(gzip ? { compressed: 'gzip', textBytes: text.size } : {})
				}
			});
		});
	} catch (error) {
		await services.storage.delete(rawKey); // no blob without its row
		throw error;
	}
	return { capture: await requireCaptureSummary(services.db, input.workspaceId, id), detected };
}
