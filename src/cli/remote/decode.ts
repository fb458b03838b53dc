/**
 * `decode --server URL --map NAME [--revision …] [--out FILE] CAPTURE`: the server decodes a
 * processed capture with a map revision and the long CSV (time,frame,signal,value,unit;
 * docs/capture-csv.md) is streamed to stdout or a file.
 */
import { once } from 'node:events';
import { createWriteStream } from 'node:fs';
import { rename, rm } from 'node:fs/promises';
import { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import type { CaptureSummary } from '../../lib/api/captures';
import { InputError } from '../errors';
import { connect, remoteError, responseError, type Remote } from './connection';
import { concreteRevision, findMap, revisionLabelOf, type RevisionChoice } from './maps';

/** A capture of the workspace by id, or by name when exactly one capture has it. */
async function findCapture(remote: Remote, idOrName: string): Promise<CaptureSummary> {
	const { captures } = await remote.api('captures.list');
	const byId = captures.find((c) => c.id === idOrName);
	if (byId) return byId;
	const byName = captures.filter((c) => c.name === idOrName);
	if (byName.length === 1) return byName[0];
	if (byName.length > 1)
		throw new InputError(
			`${byName.length} captures are called "${idOrName}"; give the id (upload prints it)`
		);
	throw new InputError(`no capture "${idOrName}" in ${remote.workspace.name}`);
}

async function toStdout(body: ReadableStream<Uint8Array>): Promise<void> {
	for await (const chunk of Readable.fromWeb(body as never)) {
		if (!process.stdout.write(chunk)) await once(process.stdout, 'drain');
	}
}

/** Streams to a temporary file renamed at the end, so a failed download leaves nothing behind. */
async function toFile(body: ReadableStream<Uint8Array>, path: string): Promise<void> {
	const temporary = `${path}.${process.pid}.tmp`;
	try {
		await pipeline(Readable.fromWeb(body as never), createWriteStream(temporary));
		await rename(temporary, path);
	} catch (error) {
		await rm(temporary, { force: true });
		throw new InputError(`${path}: ${(error as Error).message}`);
	}
}

export async function remoteDecode(options: {
	server: string;
	map: string;
	revision: RevisionChoice;
	capture: string;
	out?: string;
}): Promise<void> {
	const remote = await connect(options.server);
	const map = await findMap(remote, options.map);
	const ref = concreteRevision(map, options.revision);
	try {
		const capture = await findCapture(remote, options.capture);
		if (capture.status !== 'ready')
			throw new InputError(
				`capture "${capture.name}" is not processed (status: ${capture.status}); upload waits until it is`
			);
		const { decode, summary } = await remote.api('captures.decode', {
			params: { id: capture.id },
			body: { mapId: map.id, revision: ref }
		});
		process.stderr.write(
			`decoded "${capture.name}" with "${map.name}" ${revisionLabelOf(ref)}: ${summary.channels.length} channels\n`
		);
		const response = await remote.request(
			'captures.export',
			{ params: { id: capture.id }, query: { kind: 'long', decode: decode.id } },
			{ headers: { accept: 'text/csv, application/json' } }
		);
		if (!response.ok || !response.body) throw await responseError(response);
		if (options.out === undefined) await toStdout(response.body);
		else await toFile(response.body, options.out);
	} catch (error) {
		throw remoteError(error, remote.server);
	}
}
