/** `decode --map MAP.json CAPTURE.csv`: one CSV row per decoded signal sample, streamed. */
import { z } from 'zod';
import { compileMap } from '../../lib/can/decoder';
import { CaptureFormatError } from '../../lib/can/capture/detect-layout';
import type { FrameSink } from '../../lib/can/capture/frame-store';
import { ingestCaptureInto } from '../../lib/can/capture/ingest';
import { mapPath, parseCommand } from '../args';
import type { Command } from '../command';
import { csvText } from '../../lib/can/csv-cell';
import { formatValue } from '../csv-text';
import { EXIT, InputError } from '../errors';
import { createOutput, openCapture, readMapFile } from '../io';
import { serverOption } from '../remote/connection';
import { remoteDecode } from '../remote/decode';
import { revisionOption } from '../remote/maps';

const schema = z
	.object({
		map: mapPath,
		strict: z.boolean().default(false),
		verbose: z.boolean().default(false),
		server: serverOption,
		revision: revisionOption.optional(),
		out: z.string().min(1, '--out needs a file name').optional(),
		positionals: z
			.array(z.string())
			.min(1, 'CAPTURE.csv is required')
			.max(1, 'give one capture file at a time')
	})
	.superRefine((o, ctx) => {
		const remoteOnly = { revision: o.revision, out: o.out } as const;
		const localOnly = { strict: o.strict, verbose: o.verbose } as const;
		for (const [name, value] of Object.entries(o.server === undefined ? remoteOnly : localOnly))
			if (value !== undefined && value !== false)
				ctx.addIssue({
					code: 'custom',
					path: [name],
					message:
						o.server === undefined
							? 'goes with --server (decoding on a server)'
							: 'is for decoding a local file, not with --server'
				});
	});

/** Bad rows listed one by one on stderr; the rest are only counted. */
const BAD_ROWS_SHOWN = 20;

export const command: Command = {
	usage: `Usage: decode --map MAP.json [--strict] [--verbose] CAPTURE.csv
       decode --server URL --map NAME [--revision N|latest|draft] [--out FILE] CAPTURE

Decodes every frame the map defines and prints CSV to stdout:
  time,frame,signal,value,unit
time is seconds from the capture's first frame; value is the physical value (raw × scale + offset).
Signals that are absent (other multiplexer page, short frame) or flagged not available are skipped.
The capture's column layout is detected (canonical: time,id,extended,dlc,data); unreadable rows are
reported on stderr by line number and skipped.
  --strict    exit 1 if any row could not be read
  --verbose   print the detected layout on stderr
With --server the server decodes CAPTURE (a processed capture's id, or its name) with the map
NAME (name or id) as of --revision (default latest), and its CSV of the same columns is written to
stdout or --out FILE. Token from FRAMEWRIGHT_TOKEN; see docs/cli.md, "Remote use".`,

	async run(argv) {
		const options = parseCommand(
			'decode',
			argv,
			{
				map: { type: 'string' },
				strict: { type: 'boolean' },
				verbose: { type: 'boolean' },
				server: { type: 'string' },
				revision: { type: 'string' },
				out: { type: 'string' }
			},
			schema
		);
		if (options.server !== undefined) {
			await remoteDecode({
				server: options.server,
				map: options.map,
				revision: options.revision ?? 'latest',
				capture: options.positionals[0],
				out: options.out
			});
			return EXIT.ok;
		}
		const capturePath = options.positionals[0];
		const compiled = compileMap(await readMapFile(options.map));
		const source = await openCapture(capturePath);
		const out = createOutput();

		const channels = compiled.channels;
		const middle = channels.map((c) => `,${csvText(c.frameName)},${csvText(c.signalName)},`);
		const end = channels.map((c) => `,${csvText(c.unit)}\n`);
		const values = new Float64Array(Math.max(1, channels.length));
		const sink: FrameSink = {
			add(time, id, extended, data, length) {
				const frame = compiled.lookup(id, extended);
				if (frame === undefined) return;
				frame.decode(data, 0, length, values, frame.channelStart);
				const stamp = time.toFixed(6);
				for (let c = frame.channelStart; c < frame.channelStart + frame.channelCount; c++) {
					const v = values[c];
					if (v === v) out.write(stamp + middle[c] + formatValue(v) + end[c]);
				}
			}
		};
		// Read the next chunk of the file only once stdout has taken what we wrote.
		async function* paced() {
			for await (const chunk of source) {
				await out.drain();
				yield chunk;
			}
		}

		out.write('time,frame,signal,value,unit\n');
		let report;
		try {
			report = await ingestCaptureInto(paced(), sink);
		} catch (error) {
			if (error instanceof CaptureFormatError)
				throw new InputError(`${capturePath}: ${error.message}`);
			throw error;
		}
		await out.end();

		if (options.verbose)
			for (const note of report.layoutNotes) process.stderr.write(`layout: ${note}\n`);
		for (const bad of report.badRows.slice(0, BAD_ROWS_SHOWN)) {
			process.stderr.write(`${capturePath}:${bad.line}: ${bad.reason}\n`);
		}
		for (const warning of report.warnings) process.stderr.write(`warning: ${warning}\n`);
		if (report.frameCount === 0 && report.badRowCount > 0) return EXIT.failure;
		if (options.strict && report.badRowCount > 0) return EXIT.failure;
		return EXIT.ok;
	}
};
