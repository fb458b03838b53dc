/**
 * The shapes capture routes accept and store, each defined once with zod. Stored JSON columns are
 * parsed with the same schemas when read back, so a row altered by hand fails loudly, not silently.
 */
import { z } from 'zod';
import { captureLayoutSchema } from '../../can/capture/layout';

/** The importer's guess from the first bytes of an upload, shown on the layout confirmation screen. */
export const detectedLayoutSchema = z.object({
	layout: captureLayoutSchema,
	notes: z.array(z.string()),
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

export const captureStatusSchema = z.enum(['uploaded', 'processing', 'ready', 'failed']);
