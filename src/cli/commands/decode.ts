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

const schema = z.object({
	map: mapPath,
	strict: z.boolean().default(false),
	verbose: z.boolean().default(false),
	positionals: z
		.array(z.string())
		.min(1, 'CAPTURE.csv is required')
		.max(1, 'give one capture file at a time')
});

/** Bad rows listed one by one on stderr; the rest are only counted. */
const BAD_ROWS_SHOWN = 20;

export const command: Command = {
	usage: `Usage: decode --map MAP.json [--strict] [--verbose] CAPTURE.csv

Decodes every frame the map defines and prints CSV to stdout:
  time,frame,signal,value,unit
time is seconds from the capture's first frame; value is the physical value (raw × scale + offset).
Signals that are absent (other multiplexer page, short frame) or flagged not available are skipped.
The capture's column layout is detected (canonical: time,id,extended,dlc,data); unreadable rows are
reported on stderr by line number and skipped.
  --strict    exit 1 if any row could not be read
  --verbose   print the detected layout on stderr`,

	async run(argv) {
		const options = parseCommand(
			'decode',
			argv,
			{ map: { type: 'string' }, strict: { type: 'boolean' }, verbose: { type: 'boolean' } },
			schema
		);
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
