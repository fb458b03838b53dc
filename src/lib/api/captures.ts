/**
 * The capture API's contract (`/api/workspaces/{ws}/captures/…`: upload, processing, decode
 * records). Stored JSON columns are parsed with the same schemas when read back, so a row altered
 * by hand fails loudly, not silently. The views of a decode are in `capture-views.ts`.
 */
import { z } from 'zod';
import { captureOriginSchema } from '../can/capture/clock';
import { captureLayoutSchema } from '../can/capture/layout';
import { personRefSchema, timestampSchema } from './shapes';

/** The importer's guess from the first bytes of an upload, shown on the layout confirmation screen. */
export const detectedLayoutSchema = z.object({
	layout: captureLayoutSchema,
	notes: z.array(z.string()),
	/**
	 * Why the importer could not read the columns itself; the file is kept and the person maps
	 * them on the confirmation screen. Absent on layouts detected before this existed.
	 */
	problem: z.string().nullable().default(null),
	/** The first rows split by the detected delimiter (header included), for the preview table. */
	sampleRows: z.array(z.array(z.string()))
});
export type DetectedLayout = z.infer<typeof detectedLayoutSchema>;

/** What processing found, kept with the capture (bad rows by line, so the user can fix the file). */
export const captureReportSchema = z.object({
	frameCount: z.number().int().min(0),
	lineCount: z.number().int().min(0),
	badRows: z.array(z.object({ line: z.number().int().min(1), reason: z.string() })),
	badRowCount: z.number().int().min(0),
	warnings: z.array(z.string()),
	layoutNotes: z.array(z.string()),
	/** The capture's bus names in bus order (none: one unnamed bus). Absent on older reports. */
	buses: z.array(z.string()).default([]),
	/** Whether the file had a direction column (the frames table then shows it). */
	hasDirection: z.boolean().default(false),
	/** How the file wrote time, with its first frame's absolute time (docs/capture-csv.md, "Wall-clock times"). */
	origin: captureOriginSchema.default({ kind: 'relative', seconds: 0 })
});
export type CaptureReport = z.infer<typeof captureReportSchema>;

export const processCaptureInputSchema = z.strictObject({ layout: captureLayoutSchema });

/** `?name=` of an upload: the file name as the browser gave it (no folders). */
export const uploadQuerySchema = z.object({
	name: z
		.string({ error: 'give the file name as ?name=' })
		.trim()
		.min(1, 'give the file name as ?name=')
		.max(255, 'the file name is longer than 255 characters')
		.refine(
			// Control characters are exactly what this check refuses.
			// eslint-disable-next-line no-control-regex
			(n) => !/[\\/\u0000-\u001f]/.test(n),
			'the file name must not contain folders or control characters'
		)
});

// ---- the capture's own bit rate (docs/capture-csv.md, "Bit rate") ----

const BITRATE_HINT = 'A whole number of bit/s from 1000 to 8000000, e.g. 500000.';
const DATA_BITRATE_HINT =
	'The CAN FD data-phase bit rate: a whole number of bit/s from 1000 to 16000000, e.g. 2000000 — or leave it empty.';

/** The capture bit rate form: the nominal rate, and the data-phase rate of CAN FD captures (optional). */
export const captureBitrateInputSchema = z
	.strictObject({
		bitrate: z
			.number({ error: BITRATE_HINT })
			.int(BITRATE_HINT)
			.min(1000, BITRATE_HINT)
			.max(8_000_000, BITRATE_HINT),
		dataBitrate: z
			.number({ error: DATA_BITRATE_HINT })
			.int(DATA_BITRATE_HINT)
			.min(1000, DATA_BITRATE_HINT)
			.max(16_000_000, DATA_BITRATE_HINT)
			.nullable()
			.default(null)
	})
	.refine((b) => b.dataBitrate === null || b.dataBitrate >= b.bitrate, {
		path: ['dataBitrate'],
		message:
			'The data-phase bit rate must be at least the nominal bit rate (the switch makes the data phase faster, never slower).'
	});
export type CaptureBitrateInput = z.output<typeof captureBitrateInputSchema>;

/** Where a capture's bit rate comes from: set by a person, guessed from a map, or the workspace's usual one. */
export const captureBitrateSchema = z.object({
	bitrate: z.number().int(),
	dataBitrate: z.number().int().nullable(),
	source: z.discriminatedUnion('kind', [
		z.object({ kind: z.literal('set') }),
		z.object({ kind: z.literal('map'), mapName: z.string() }),
		z.object({ kind: z.literal('workspace') })
	])
});
export type CaptureBitrate = z.infer<typeof captureBitrateSchema>;

/** How a capture's bit rate is described next to every figure that uses it. */
export function bitrateSourceText(b: CaptureBitrate): string {
	if (b.source.kind === 'set') return 'set for this capture';
	if (b.source.kind === 'map') return `guessed from map ${b.source.mapName}`;
	return 'guessed from the workspace’s maps (not decoded yet)';
}

// ---- answers ----

export const captureStatusSchema = z.enum(['uploaded', 'processing', 'ready', 'failed']);
export type CaptureStatus = z.infer<typeof captureStatusSchema>;

/** One decode of a capture: which map revision (or which draft version) it used, so it can be reproduced. */
export const decodeRecordSchema = z.object({
	id: z.string(),
	/** null once the map was deleted. */
	mapId: z.string().nullable(),
	mapName: z.string(),
	/** Revision number, or null for the draft. */
	revision: z.number().int().nullable(),
	draftVersion: z.number().int().nullable(),
	decodedAt: timestampSchema,
	decodedBy: personRefSchema.nullable(),
	/** The one bus decoded (index into the report's `buses`); null: every bus. */
	bus: z.number().int().nullable().default(null)
});
export type DecodeRecord = z.infer<typeof decodeRecordSchema>;

export const captureSummarySchema = z.object({
	id: z.string(),
	name: z.string(),
	fileName: z.string(),
	sizeBytes: z.number().int(),
	uploadedAt: timestampSchema,
	uploadedBy: personRefSchema.nullable(),
	status: captureStatusSchema,
	/** 0–1 while processing. */
	progress: z.number(),
	frameCount: z.number().int().nullable(),
	durationS: z.number().nullable(),
	error: z.string().nullable(),
	lastDecode: decodeRecordSchema
		.pick({ id: true, mapId: true, mapName: true, revision: true, decodedAt: true })
		.nullable()
});
export type CaptureSummary = z.infer<typeof captureSummarySchema>;

export const captureListResponseSchema = z.object({ captures: z.array(captureSummarySchema) });
export type CaptureListResponse = z.infer<typeof captureListResponseSchema>;

/** The GET capture shape (API and page load). */
export const captureDetailSchema = z.object({
	capture: captureSummarySchema,
	detected: detectedLayoutSchema.nullable(),
	layout: captureLayoutSchema.nullable(),
	report: captureReportSchema.nullable(),
	decodes: z.array(decodeRecordSchema),
	/** The bit rate bus load and timing use (absent from answers made before it existed). */
	bitrate: captureBitrateSchema.optional()
});
export type CaptureDetail = z.infer<typeof captureDetailSchema>;

/** An upload stored: the capture and the layout guess the person confirms before processing. */
export const uploadResponseSchema = z.object({
	capture: captureSummarySchema,
	detected: detectedLayoutSchema
});
export type UploadResponse = z.infer<typeof uploadResponseSchema>;

/** The 413 of an upload over the limit, with the limit in bytes. */
export const tooLargeProblemSchema = z.looseObject({ error: z.string(), maxBytes: z.number() });

export const captureStatusResponseSchema = z.object({
	status: captureStatusSchema,
	progress: z.number(),
	error: z.string().nullable()
});
export type CaptureStatusResponse = z.infer<typeof captureStatusResponseSchema>;

export const processResponseSchema = z.object({ capture: captureSummarySchema });
export type ProcessResponse = z.infer<typeof processResponseSchema>;

/** `r3`, or `draft (save 7)` for a draft decode, as shown next to every decoded figure. */
export function decodeRevisionLabel(d: Pick<DecodeRecord, 'revision' | 'draftVersion'>): string {
	if (d.revision !== null) return `r${d.revision}`;
	return d.draftVersion === null ? 'draft' : `draft (save ${d.draftVersion})`;
}
