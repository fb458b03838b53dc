/**
 * Sends one capture file as the raw request body with XMLHttpRequest — fetch() cannot report upload
 * progress — and turns the server's refusals (413 too large, 415 not a capture, 400 empty) into
 * sentences that say what to do next.
 */
import { ApiError } from '$lib/api/client';
import type { UploadResponse as UploadAnswer } from '$lib/api/captures';

export type { UploadAnswer };

/** The part of XMLHttpRequest this module uses, so tests can hand in a stand-in. */
export interface UploadRequest {
	open(method: string, url: string): void;
	setRequestHeader(name: string, value: string): void;
	send(body: Blob): void;
	abort(): void;
	readonly status: number;
	readonly responseText: string;
	upload: {
		onprogress: ((e: { loaded: number; total: number; lengthComputable: boolean }) => void) | null;
	};
	onload: (() => void) | null;
	onerror: (() => void) | null;
	onabort: (() => void) | null;
}

export interface UploadOptions {
	/** Fraction 0–1 of the bytes sent. */
	onprogress?: (fraction: number) => void;
	signal?: AbortSignal;
	createRequest?: () => UploadRequest;
}

/** What a refusal means for this file, when the server's answer carries no message of its own. */
export function refusalFallback(status: number, fileName: string): string {
	switch (status) {
		case 413:
			return `${fileName} is larger than this workspace's capture size limit. Split the recording or ask the administrator to raise the limit.`;
		case 415:
			return `${fileName} does not look like a capture: expected a CSV of frames (time, ID, data …), e.g. time,id,extended,dlc,data.`;
		case 400:
			return `${fileName} was not accepted: it is empty or holds no frames.`;
		case 401:
			return 'Your session has ended. Sign in again, then upload the file again.';
		case 403:
			return 'Your role in this workspace does not allow uploading captures.';
		default:
			return `The upload of ${fileName} failed (the server answered ${status}). Try again.`;
	}
}

/** The ApiError for a finished request that was not a success. */
export function uploadError(status: number, responseText: string, fileName: string): ApiError {
	let body: Record<string, unknown> = {};
	try {
		const parsed: unknown = JSON.parse(responseText);
		if (parsed && typeof parsed === 'object') body = parsed as Record<string, unknown>;
	} catch {
		// A proxy's HTML error page: fall back to our own words.
	}
	const serverMessage = typeof body.error === 'string' && body.error ? body.error : null;
	const issues = Array.isArray(body.issues) ? (body.issues as ApiError['issues']) : [];
	// The server's message explains the detail; the file name says which of several files it is about.
	const message = serverMessage
		? `${fileName}: ${serverMessage}`
		: refusalFallback(status, fileName);
	return new ApiError(status, message, issues, body);
}

export function uploadCapture(
	url: string,
	file: Blob & { name: string },
	options: UploadOptions = {}
): Promise<UploadAnswer> {
	const request = options.createRequest?.() ?? (new XMLHttpRequest() as unknown as UploadRequest);
	return new Promise<UploadAnswer>((resolve, reject) => {
		if (options.signal?.aborted)
			return reject(new ApiError(0, `The upload of ${file.name} was cancelled.`));
		options.signal?.addEventListener('abort', () => request.abort(), { once: true });
		request.open('POST', url);
		// Any Content-Type is accepted; this one keeps the browser from guessing a form encoding.
		request.setRequestHeader('content-type', 'application/octet-stream');
		request.upload.onprogress = (e) => {
			if (e.lengthComputable && e.total > 0) options.onprogress?.(Math.min(1, e.loaded / e.total));
		};
		request.onload = () => {
			if (request.status === 201 || request.status === 200) {
				try {
					options.onprogress?.(1);
					resolve(JSON.parse(request.responseText) as UploadAnswer);
				} catch {
					reject(
						new ApiError(
							request.status,
							`The server accepted ${file.name} but its answer could not be read. Reload the page to see it.`
						)
					);
				}
			} else {
				reject(uploadError(request.status, request.responseText, file.name));
			}
		};
		// A server refusing an oversized body early may close the connection before the browser reads its 413.
		request.onerror = () =>
			reject(
				new ApiError(
					0,
					`The upload of ${file.name} stopped before the server answered. Check your connection and try again; a very large file may be over this workspace's capture size limit.`
				)
			);
		request.onabort = () => reject(new ApiError(0, `The upload of ${file.name} was cancelled.`));
		request.send(file);
	});
}
