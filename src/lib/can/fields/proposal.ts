/**
 * The shapes of field proposals (zod, so the worker, the API and the CLI share one definition).
 * Bit positions follow docs/bit-numbering.md: `startBit` is the field's least significant bit.
 * Every proposal carries `muxValue` (the selector value of the page it holds on; null = every
 * frame) and a one-sentence `evidence`; docs/field-proposals.md explains each kind.
 */
import { z } from 'zod';
import { byteOrderSchema } from '../map';

const share = z.number().min(0).max(1);
const bit = z.number().int().min(0).max(511);

const common = {
	startBit: bit,
	length: z.number().int().min(1).max(64),
	byteOrder: byteOrderSchema,
	/** 0…1; how it is computed depends on the kind (docs/field-proposals.md). */
	confidence: share,
	muxValue: z.number().int().min(0).nullable(),
	evidence: z.string()
};

export const constantProposalSchema = z.strictObject({
	kind: z.literal('constant'),
	...common,
	/** The unsigned raw value the bits always hold. */
	value: z.number().int().min(0)
});

export const counterProposalSchema = z.strictObject({
	kind: z.literal('counter'),
	...common,
	/** Added to the raw value from one frame to the next, modulo 2^length. */
	step: z.number().int().min(1),
	/** Share of consecutive frame pairs that follow the rule. */
	share,
	pairs: z.number().int().min(1)
});

export const checksumAlgorithmSchema = z.enum(['xor', 'sum', 'crc8-sae-j1850', 'crc8-autosar']);
export type ChecksumAlgorithm = z.infer<typeof checksumAlgorithmSchema>;

export const checksumProposalSchema = z.strictObject({
	kind: z.literal('checksum'),
	...common,
	algorithm: checksumAlgorithmSchema,
	/** Byte fed to the function before the payload bytes; null when none is. */
	dataId: z.number().int().min(0).max(255).nullable(),
	/** Payload bytes fed to the function, in this order. */
	inputBytes: z.array(z.number().int().min(0)),
	/** Payload bits read as 0 for the function (a counter left out of the input). */
	clearedBits: z.array(bit),
	/** Share of frames whose checksum byte the function explains. */
	share,
	/** Other bytes the same relation explains equally well (an XOR checksum can sit in any byte it covers). */
	alternativeBytes: z.array(z.number().int().min(0))
});

export const muxProposalSchema = z.strictObject({
	kind: z.literal('mux'),
	...common,
	pages: z.array(z.strictObject({ value: z.number().int().min(0), frames: z.number().int() })),
	/** Bits whose flips the selector explains: they change far less between frames of one page. */
	switchedBits: z.array(bit),
	/** When the selector also advances like a counter: its step; otherwise null. */
	counterStep: z.number().int().min(1).nullable()
});

export const valueProposalSchema = z.strictObject({
	kind: z.literal('value'),
	...common,
	signed: z.boolean(),
	/** Smallest and largest raw value seen (signed when `signed`). */
	rawMin: z.number(),
	rawMax: z.number(),
	/** Share of frame pairs in which each bit flipped, least significant bit first. */
	flipRates: z.array(share)
});

export const fieldProposalSchema = z.discriminatedUnion('kind', [
	constantProposalSchema,
	counterProposalSchema,
	checksumProposalSchema,
	muxProposalSchema,
	valueProposalSchema
]);

export type ConstantProposal = z.infer<typeof constantProposalSchema>;
export type CounterProposal = z.infer<typeof counterProposalSchema>;
export type ChecksumProposal = z.infer<typeof checksumProposalSchema>;
export type MuxProposal = z.infer<typeof muxProposalSchema>;
export type ValueProposal = z.infer<typeof valueProposalSchema>;
export type FieldProposal = z.infer<typeof fieldProposalSchema>;
export type FieldKind = FieldProposal['kind'];

export const idProposalsSchema = z.strictObject({
	id: z.number().int().min(0),
	extended: z.boolean(),
	/** Frames of this ID in the capture. */
	frames: z.number().int().min(0),
	/** Frames analysed: those with the most common payload length. */
	analysedFrames: z.number().int().min(0),
	payloadLength: z.number().int().min(0),
	fields: z.array(fieldProposalSchema),
	/** Why little or nothing was proposed, or what was left out. */
	notes: z.array(z.string())
});
export type IdProposals = z.infer<typeof idProposalsSchema>;
