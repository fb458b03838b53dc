/**
 * The capture API's contract (`/api/workspaces/{ws}/captures/…`: upload, processing, decode
 * records). Stored JSON columns are parsed with the same schemas when read back, so a row altered
 * by hand fails loudly, not silently. The views of a decode are in `capture-views.ts`.
 */
import { z } from 'zod';
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
	layoutNotes: z.array(z.string())
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
	decodedBy: personRefSchema.nullable()
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
	decodes: z.array(decodeRecordSchema)
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
