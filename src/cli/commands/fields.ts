/** `fields CAPTURE.csv [--id ID]`: proposed fields of each ID in a capture, as JSON. */
import { z } from 'zod';
import { CaptureFormatError } from '../../lib/can/capture/detect-layout';
import { ingestCapture } from '../../lib/can/capture/ingest';
import { proposeCaptureFields } from '../../lib/can/fields';
import { canIdArgument, parseCommand } from '../args';
import type { Command } from '../command';
import { EXIT, InputError } from '../errors';
import { openCapture, printJson } from '../io';

const schema = z.object({
	id: canIdArgument.optional(),
	positionals: z
		.array(z.string())
		.min(1, 'CAPTURE.csv is required')
		.max(1, 'give one capture file at a time')
});

/** Bad rows listed one by one on stderr; the rest are only counted. */
const BAD_ROWS_SHOWN = 20;

const hex = (id: number) => `0x${id.toString(16).toUpperCase()}`;

export const command: Command = {
	usage: `Usage: fields CAPTURE.csv [--id ID]

Proposes what the bits of each ID carry and prints JSON to stdout:
  {"ids": [{"id", "extended", "frames", "analysedFrames", "payloadLength", "notes",
            "fields": [{"kind", "startBit", "length", "byteOrder", "confidence", "muxValue",
                        "evidence", …details}]}]}
kind is "constant", "counter", "checksum", "mux" or "value"; startBit is the field's least
significant bit (docs/bit-numbering.md); docs/field-proposals.md explains each kind and its details.
  --id ID   only this identifier (0x-prefixed hex or decimal)
The capture's column layout is detected (canonical: time,id,extended,dlc,data); unreadable rows are
reported on stderr by line number and skipped.`,

	async run(argv) {
		const options = parseCommand('fields', argv, { id: { type: 'string' } }, schema);
		const capturePath = options.positionals[0];
		const source = await openCapture(capturePath);
		let ingested;
		try {
			ingested = await ingestCapture(source);
		} catch (error) {
			if (error instanceof CaptureFormatError)
				throw new InputError(`${capturePath}: ${error.message}`);
			throw error;
		}
		for (const bad of ingested.badRows.slice(0, BAD_ROWS_SHOWN)) {
			process.stderr.write(`${capturePath}:${bad.line}: ${bad.reason}\n`);
		}
		for (const warning of ingested.warnings) process.stderr.write(`warning: ${warning}\n`);
		if (ingested.frameCount === 0) {
			throw new InputError(
				`${capturePath}: no frame could be read, so there is nothing to analyse`
			);
		}
		const wanted = options.id;
		const ids = proposeCaptureFields(
			ingested.store,
			wanted === undefined ? undefined : (id) => id === wanted
		);
		if (wanted !== undefined && ids.length === 0) {
			throw new InputError(`${capturePath}: ID ${hex(wanted)} does not occur in the capture`);
		}
		printJson({ ids });
		return EXIT.ok;
	}
};
