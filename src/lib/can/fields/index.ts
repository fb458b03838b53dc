/**
 * Field proposals for undocumented frames, and correlation of candidate fields with a known
 * channel: the public surface for the capture worker, the views and the CLI.
 * docs/field-proposals.md describes the kinds, the evidence and the confidence.
 */
export { framesById, idFramesFromPayloads, type IdFrames } from './frames';
export { idFramesFromChunks } from './chunked';
export { proposeCaptureFields, proposeFields, MIN_FRAMES } from './propose';
export {
	checksumAlgorithmSchema,
	fieldProposalSchema,
	idProposalsSchema,
	type ChecksumAlgorithm,
	type ChecksumProposal,
	type ConstantProposal,
	type CounterProposal,
	type FieldKind,
	type FieldProposal,
	type IdProposals,
	type MuxProposal,
	type ValueProposal
} from './proposal';
export {
	candidatesFromProposals,
	correlateFields,
	type CandidateField,
	type ChannelSamples,
	type CorrelationOptions,
	type FieldCorrelation
} from './correlate';
export { crc8, CRC8_AUTOSAR, CRC8_SAE_J1850, type Crc8Parameters } from './crc8';
