/**
 * Receives a capture upload: streams the request body straight to blob storage (never whole in
 * memory), keeping only the first bytes aside to check that the file is text and to guess its
 * column layout. Refusals are clear and leave nothing stored: 413 over the size limit (from
 * Content-Length up front, and while streaming), 415 for binary files or files with no readable
 * capture columns, 400 for an empty body.
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

/** Passes the body through, keeping its first DETECTION_BYTES and refusing binary content early. */
async function* tapped(
	body: ReadableStream<Uint8Array>,
	head: { bytes: Uint8Array; length: number }
): AsyncGenerator<Uint8Array> {
	let sniffed = false;
	for await (const value of byteChunks(body)) {
		if (head.length < DETECTION_BYTES) {
			const n = Math.min(DETECTION_BYTES - head.length, value.byteLength);
			head.bytes.set(value.subarray(0, n), head.length);
			head.length += n;
		}
		if (!sniffed && head.length >= SNIFF_BYTES) {
			sniffed = true;
			if (looksBinary(head.bytes.subarray(0, SNIFF_BYTES))) throw new NotACaptureError();
		}
		yield value;
	}
	if (!sniffed && looksBinary(head.bytes.subarray(0, head.length))) throw new NotACaptureError();
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
	const head = { bytes: new Uint8Array(DETECTION_BYTES), length: 0 };
	let size: number;
	try {
		({ size } = await services.storage.put(keys.raw, tapped(input.body, head), {
			maxBytes: limit
		}));
	} catch (error) {
		if (error instanceof StorageLimitError) throw tooLarge();
		if (error instanceof NotACaptureError)
			throw refuseNotCapture(
				'it holds binary data, but captures are CSV text (time, ID, data per row).'
			);
		throw error;
	}
	if (size === 0) {
		await services.storage.delete(keys.raw);
		throw new Problem(400, 'The file is empty; there is nothing to upload.');
	}

	let detected: DetectedLayout;
	try {
		detected = detectFromHead(head.bytes.subarray(0, head.length), head.length === size);
	} catch (error) {
		await services.storage.delete(keys.raw);
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
				rawKey: keys.raw,
				detected,
				layout: null
			});
			await appendAudit(trx, {
				workspaceId: input.workspaceId,
				actorId: input.actorId,
				action: 'capture.upload',
				target: id,
				details: { fileName: input.fileName, sizeBytes: size }
			});
		});
	} catch (error) {
		await services.storage.delete(keys.raw); // no blob without its row
		throw error;
	}
	return { capture: await requireCaptureSummary(services.db, input.workspaceId, id), detected };
}
