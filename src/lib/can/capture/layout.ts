/**
 * The column layout of a capture CSV file: what the importer guessed, shown to the user to confirm
 * or correct, and what the ingest then follows. One zod schema is the single definition.
 * The canonical layout is `time,id,extended,dlc,data` (docs/capture-csv.md).
 */
import { z } from 'zod';

/** Delimiters the importer understands; papaparse guesses among the same set. */
export const CAPTURE_DELIMITERS = [',', ';', '\t', '|'] as const;

export const timeUnitSchema = z.enum(['s', 'ms', 'us']);
export type TimeUnit = z.infer<typeof timeUnitSchema>;

/** Seconds per unit of each time unit. */
export const SECONDS_PER_UNIT: Record<TimeUnit, number> = { s: 1, ms: 1e-3, us: 1e-6 };

const columnIndex = z.number().int().min(0).max(1000);

export const captureLayoutSchema = z
	.strictObject({
		delimiter: z.enum(CAPTURE_DELIMITERS),
		hasHeader: z.boolean(),
		timeColumn: columnIndex,
		timeUnit: timeUnitSchema,
		/** Times are wall-clock (Unix epoch) rather than seconds since the recording started. */
		epochTime: z.boolean(),
		idColumn: columnIndex,
		/** `hex` accepts an optional 0x prefix; `decimal` is plain base 10. */
		idFormat: z.enum(['hex', 'decimal']),
		/** null: no flag column, so an ID above 0x7FF is taken as extended. */
		extendedColumn: columnIndex.nullable(),
		dlcColumn: columnIndex.nullable(),
		/** `code`: ISO 11898-1 DLC 0–15; `bytes`: a byte count; `either`: whichever matches the data. */
		dlcMeaning: z.enum(['code', 'bytes', 'either']),
		/** One column of hex bytes ("11 22 33" or "112233") … */
		dataColumn: columnIndex.nullable(),
		/** … or one column per payload byte, in byte order. */
		byteColumns: z.array(columnIndex).max(64)
	})
	.refine((l) => (l.dataColumn === null) !== (l.byteColumns.length === 0), {
		message: 'give either dataColumn or byteColumns (not both, not neither)',
		path: ['dataColumn']
	});
export type CaptureLayout = z.infer<typeof captureLayoutSchema>;

/** The layout exports write and the importer tries first. */
export const CANONICAL_LAYOUT: CaptureLayout = {
	delimiter: ',',
	hasHeader: true,
	timeColumn: 0,
	timeUnit: 's',
	epochTime: false,
	idColumn: 1,
	idFormat: 'hex',
	extendedColumn: 2,
	dlcColumn: 3,
	dlcMeaning: 'either',
	dataColumn: 4,
	byteColumns: []
};

export const CANONICAL_HEADER = 'time,id,extended,dlc,data';
