/**
 * The column layout of a capture CSV file: what the importer guessed, shown to the user to confirm
 * or correct, and what the ingest then follows. One zod schema is the single definition.
 * The canonical layout is `time,id,extended,dlc,data` (docs/capture-csv.md).
 */
import { z } from 'zod';

/** Delimiters the importer understands; papaparse guesses among the same set. */
export const CAPTURE_DELIMITERS = [',', ';', '\t', '|'] as const;

export const timeUnitSchema = z.enum(['s', 'ms', 'us', 'ns']);
export type TimeUnit = z.infer<typeof timeUnitSchema>;

/** Seconds per unit of each time unit. */
export const SECONDS_PER_UNIT: Record<TimeUnit, number> = { s: 1, ms: 1e-3, us: 1e-6, ns: 1e-9 };

/**
 * How the time column is written: a number in `timeUnit`; a time of day `hh:mm:ss.ffffff` (seconds
 * since midnight, continuing past 24:00 when the recording crosses midnight); or an ISO 8601
 * date-time (seconds since 1970, UTC unless the text names its offset).
 */
export const timeFormatSchema = z.enum(['number', 'time-of-day', 'date-time']);
export type TimeFormat = z.infer<typeof timeFormatSchema>;

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
		byteColumns: z.array(columnIndex).max(64),
		// Later additions default to "not in the file", so layouts stored before them still read.
		timeFormat: timeFormatSchema.default('number'),
		/**
		 * A per-frame label kept as the frame's tag (a flag or note column). `after-bytes`: the column
		 * right after the last byte the DLC asks for, for rows of varying width.
		 */
		tagColumn: z
			.union([columnIndex, z.literal('after-bytes')])
			.nullable()
			.default(null),
		/** Which bus a frame was seen on, by name or number (captures of several buses). */
		busColumn: columnIndex.nullable().default(null),
		/** Received or transmitted by the logger. */
		directionColumn: columnIndex.nullable().default(null),
		/** Marks remote and error frames (data frames leave it empty or say so). */
		kindColumn: columnIndex.nullable().default(null)
	})
	.refine((l) => (l.dataColumn === null) !== (l.byteColumns.length === 0), {
		message: 'give either dataColumn or byteColumns (not both, not neither)',
		path: ['dataColumn']
	});
export type CaptureLayout = z.infer<typeof captureLayoutSchema>;

/** The columns a layout gives no role to (shown as "ignored"), among the first `count`. */
export function unusedColumns(layout: CaptureLayout, count: number): number[] {
	const used = new Set<number>([
		layout.timeColumn,
		layout.idColumn,
		...layout.byteColumns,
		...[
			layout.extendedColumn,
			layout.dlcColumn,
			layout.dataColumn,
			layout.busColumn,
			layout.directionColumn,
			layout.kindColumn,
			layout.tagColumn
		].filter((c): c is number => typeof c === 'number')
	]);
	return Array.from({ length: count }, (_, c) => c).filter((c) => !used.has(c));
}

/** Seconds per unit of the layout's time column (time-of-day and date-times are read in seconds). */
export const secondsPerTimeUnit = (layout: CaptureLayout): number =>
	layout.timeFormat === 'number' ? SECONDS_PER_UNIT[layout.timeUnit] : 1;

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
	byteColumns: [],
	timeFormat: 'number',
	tagColumn: null,
	busColumn: null,
	directionColumn: null,
	kindColumn: null
};

export const CANONICAL_HEADER = 'time,id,extended,dlc,data';
