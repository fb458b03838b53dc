/**
 * The map model: zod schemas are the single definition of a broadcast map's shape.
 * Bit numbering and the `framewright-map@1` JSON format are specified in docs/bit-numbering.md and docs/map-format.md.
 * Structural checks that need the whole map (overlaps, duplicates) live in lint.ts.
 */
import { z } from 'zod';
import { alertRuleSchema } from './alerts/rule';

export const MAP_FORMAT = 'framewright-map@1';

/** Largest 29-bit identifier (ISO 11898-1 extended format). */
export const MAX_EXTENDED_ID = 0x1fffffff;
/** Largest 11-bit identifier (ISO 11898-1 base format). */
export const MAX_STANDARD_ID = 0x7ff;

/** Payload byte counts a frame may declare: classical 0–8, CAN FD 12…64 (ISO 11898-1 DLC 9–15). */
export const PAYLOAD_LENGTHS = [0, 1, 2, 3, 4, 5, 6, 7, 8, 12, 16, 20, 24, 32, 48, 64] as const;

export const byteOrderSchema = z.enum(['little', 'big']);
export type ByteOrder = z.infer<typeof byteOrderSchema>;

export const valueTypeSchema = z.enum(['unsigned', 'signed', 'float32', 'float64']);
export type ValueType = z.infer<typeof valueTypeSchema>;

/** A CAN ID written as a hex string ("0x360") or a plain number; always a number once parsed. */
export const canIdSchema = z
	.union(
		[
			z
				.number()
				.int('must be a whole number')
				.min(0, 'must not be negative')
				.max(MAX_EXTENDED_ID, 'above 0x1FFFFFFF'),
			z
				.string()
				.trim()
				.regex(/^0[xX][0-9a-fA-F]{1,8}$/, 'a hex ID like "0x360"')
				.transform((s) => Number.parseInt(s.slice(2), 16))
				.pipe(z.number().int().max(MAX_EXTENDED_ID, 'above 0x1FFFFFFF'))
		],
		{ error: 'must be a hex string like "0x360" or a whole number from 0 to 0x1FFFFFFF' }
	)
	.describe('CAN identifier: hex string "0x…" or a number');

const finite = () => z.number().refine(Number.isFinite, 'must be a finite number');

export const signalSchema = z.strictObject({
	name: z.string().trim().min(1, 'a signal needs a name').max(120),
	startBit: z
		.number()
		.int('must be a whole number')
		.min(0, 'must be 0–511 (a 64-byte payload has 512 bits)')
		.max(511, 'must be 0–511 (a 64-byte payload has 512 bits)')
		.describe('position of the least significant bit'),
	length: z
		.number()
		.int('must be a whole number')
		.min(1, 'must be 1–64 bits')
		.max(64, 'must be 1–64 bits'),
	byteOrder: byteOrderSchema.default('little'),
	valueType: valueTypeSchema.default('unsigned'),
	scale: finite().default(1),
	offset: finite().default(0),
	unit: z.string().max(40).default(''),
	min: finite().nullable().default(null),
	max: finite().nullable().default(null),
	labels: z
		.record(z.string().regex(/^-?\d+$/, 'label keys are integer raw values'), z.string())
		.default({}),
	multiplexer: z.boolean().default(false),
	muxValue: z.number().int().min(0).nullable().default(null),
	// SAE J1939-71: a suspect parameter number is 19 bits (from memory); DM1 carries it in 19 bits too.
	spn: z
		.number()
		.int('an SPN is a whole number 0…524287 (19 bits)')
		.min(0, 'an SPN is a whole number 0…524287 (19 bits)')
		.max(0x7ffff, 'an SPN is a whole number 0…524287 (19 bits)')
		.nullable()
		.default(null),
	comment: z.string().max(2000).default('')
});
export type Signal = z.output<typeof signalSchema>;
export type SignalInput = z.input<typeof signalSchema>;

export const frameSchema = z.strictObject({
	name: z.string().trim().min(1, 'a frame needs a name').max(120),
	id: canIdSchema,
	extended: z.boolean().default(false),
	length: z
		.number()
		.int()
		.refine((n) => (PAYLOAD_LENGTHS as readonly number[]).includes(n), {
			message: 'payload length must be 0–8, 12, 16, 20, 24, 32, 48 or 64 bytes'
		})
		.meta({ enum: [...PAYLOAD_LENGTHS] }) // shows the allowed lengths in the generated JSON Schema
		.default(8),
	cycleMs: z.number().positive().max(3_600_000).nullable().default(null),
	sender: z.string().max(120).default(''),
	j1939: z.boolean().default(false),
	comment: z.string().max(2000).default(''),
	signals: z.array(signalSchema).default([])
});
export type Frame = z.output<typeof frameSchema>;
export type FrameInput = z.input<typeof frameSchema>;

export const canMapSchema = z.strictObject({
	format: z.literal(MAP_FORMAT),
	name: z.string().trim().min(1, 'a map needs a name').max(200),
	bitrate: z.number().int().min(1000).max(8_000_000).default(500_000),
	frames: z.array(frameSchema).default([]),
	// Versioned with the map (part of every revision and export); optional so older files stay valid.
	alertRules: z
		.array(alertRuleSchema)
		.default([])
		.describe("alert rules on this map's channels, replayed over captures")
});
export type CanMap = z.output<typeof canMapSchema>;
export type CanMapInput = z.input<typeof canMapSchema>;
