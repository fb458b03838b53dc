/** `upload --server URL [--name NAME] CAPTURE.csv`: a capture to the server, processed and ready. */
import { createReadStream } from 'node:fs';
import { stat } from 'node:fs/promises';
import { basename } from 'node:path';
import { setTimeout as sleep } from 'node:timers/promises';
import { z } from 'zod';
import { uploadResponseSchema, type UploadResponse } from '../../lib/api/captures';
import { parseCommand } from '../args';
import type { Command } from '../command';
import { EXIT, InputError } from '../errors';
import { printJson } from '../io';
import {
	connect,
	remoteError,
	responseError,
	serverOption,
	type Remote
} from '../remote/connection';
import { formatBytes, progressReporter } from '../remote/progress';

const schema = z.object({
	server: serverOption,
	name: z.string().trim().min(1, '--name needs a name').optional(),
	positionals: z
		.array(z.string())
		.min(1, 'CAPTURE.csv is required')
		.max(1, 'give one capture file at a time')
});

/** How often the processing status is asked for while waiting. */
const POLL_MS = 250;

/** The file's bytes as they are read, counted for the progress line. */
async function* counted(path: string, onBytes: (sent: number) => void) {
	let sent = 0;
	for await (const chunk of createReadStream(path, { highWaterMark: 1 << 20 })) {
		sent += (chunk as Buffer).length;
		onBytes(sent);
		yield chunk as Buffer;
	}
}

async function send(remote: Remote, path: string, name: string): Promise<UploadResponse> {
	let size: number;
	try {
		const info = await stat(path);
		if (info.isDirectory()) throw new InputError(`${path}: is a folder, not a file`);
		size = info.size;
	} catch (error) {
		if (error instanceof InputError) throw error;
		const code = (error as NodeJS.ErrnoException).code;
		throw new InputError(
			`${path}: ${code === 'ENOENT' ? 'no such file' : (error as Error).message}`
		);
	}
	const progress = progressReporter('upload');
	const body = counted(path, (sent) =>
		progress.update(size ? sent / size : 1, `${formatBytes(sent)} of ${formatBytes(size)}`)
	);
	const response = await remote.request('captures.upload', { query: { name } }, {
		method: 'POST',
		// Streamed: the file is never held whole in memory (Node's fetch sends an async iterable).
		body: body as unknown as BodyInit,
		duplex: 'half',
		headers: {
			'content-type': 'application/octet-stream',
			'content-length': String(size),
			accept: 'application/json'
		}
	} as RequestInit);
	if (!response.ok) throw await responseError(response);
	progress.done(`${formatBytes(size)} sent`);
	return uploadResponseSchema.parse(await response.json());
}

export const command: Command = {
	usage: `Usage: upload --server URL [--name NAME] CAPTURE.csv

Uploads a capture (docs/capture-csv.md) to the access token's workspace, streaming it with progress
on stderr, accepts the column layout the server detects (its notes go to stderr as "layout: …"),
and waits until the server has processed it. Prints the capture as JSON:
  {"capture": {"id", "name", "status", "frameCount", "durationS", …}, "layout", "report"}
report counts frames and lists unreadable rows by line. --name is what the capture is called
(default: the file's name). Exit 1 if the server refuses the file or cannot read it.`,

	async run(argv) {
		const options = parseCommand(
			'upload',
			argv,
			{ server: { type: 'string' }, name: { type: 'string' } },
			schema
		);
		const path = options.positionals[0];
		const remote = await connect(options.server);
		const uploaded = await send(remote, path, options.name ?? basename(path));
		const id = uploaded.capture.id;
		for (const note of uploaded.detected.notes) process.stderr.write(`layout: ${note}\n`);
		try {
			await remote.api('captures.process', {
				params: { id },
				body: { layout: uploaded.detected.layout }
			});
			const progress = progressReporter('processing');
			for (;;) {
				const status = await remote.api('captures.status', { params: { id } });
				if (status.status === 'failed')
					throw new InputError(
						`the server could not process ${path}: ${status.error ?? 'no reason given'}`
					);
				if (status.status === 'ready') break;
				progress.update(status.progress);
				await sleep(POLL_MS);
			}
			const detail = await remote.api('captures.get', { params: { id } });
			progress.done(`done: ${detail.capture.frameCount ?? 0} frames`);
			for (const bad of detail.report?.badRows.slice(0, 20) ?? [])
				process.stderr.write(`${path}:${bad.line}: ${bad.reason}\n`);
			printJson({ capture: detail.capture, layout: detail.layout, report: detail.report });
		} catch (error) {
			throw remoteError(error, remote.server);
		}
		return EXIT.ok;
	}
};
