/**
 * The shape of a receive set file (`framewright-receive@1`), apart from how one is built: the
 * browser, tests and tools validate a file with it without loading the linking code.
 */
import { z } from 'zod';
import { byteOrderSchema, canIdSchema, valueTypeSchema } from '../map';
import { receiverKindSchema } from './profile';
import { quantitySchema } from './quantities';
import { conversionFormSchema } from './scaling';

export const RECEIVE_FORMAT = 'framewright-receive@1';

const bitField = {
	startBit: z
		.number()
		.int()
		.min(0)
		.max(511)
		.describe('least significant bit (docs/bit-numbering.md)'),
	length: z.number().int().min(1).max(64),
	byteOrder: byteOrderSchema
};

export const receiveChannelSchema = z.strictObject({
	name: z.string().min(1).describe('the wanted channel'),
	quantity: quantitySchema,
	frame: z.string().describe("the frame's name in the map"),
	id: canIdSchema,
	extended: z.boolean().describe('29-bit identifier'),
	j1939: z
		.boolean()
		.describe('match by PGN: any priority and source address (SAE J1939-21 identifier layout)'),
	signal: z.string().describe("the signal's name in the map"),
	...bitField,
	valueType: valueTypeSchema,
	multiplexer: z
		.strictObject({ ...bitField, value: z.number().int().min(0) })
		.nullable()
		.describe('present only when the multiplexer field of the frame holds this value'),
	form: conversionFormSchema.describe(
		'linear: value = raw × scale + offset; reciprocal: value = 1 / (raw × scale + offset)'
	),
	scale: z.number(),
	offset: z.number(),
	unit: z.string().describe('the unit the device shows'),
	min: z.number().nullable().describe('display range'),
	max: z.number().nullable(),
	decimals: z.number().int().min(0).max(9),
	cycleMs: z.number().nullable().describe("the frame's cycle time in the map"),
	conversion: z.string().describe('the unit conversion folded into scale and offset, for people')
});
export type ReceiveChannel = z.output<typeof receiveChannelSchema>;

export const receiveSetSchema = z.strictObject({
	format: z.literal(RECEIVE_FORMAT),
	profile: z.string(),
	kind: receiverKindSchema,
	map: z.string(),
	revision: z
		.number()
		.int()
		.min(1)
		.nullable()
		.describe('the map revision linked to; null for a file'),
	bitrate: z.number().int().min(1000).max(8_000_000).describe('bus bit rate in bit/s'),
	channels: z.array(receiveChannelSchema),
	unlinked: z
		.array(z.strictObject({ name: z.string(), required: z.boolean() }))
		.describe('wanted channels without a link: the device gets nothing for them')
});
export type ReceiveSet = z.output<typeof receiveSetSchema>;
