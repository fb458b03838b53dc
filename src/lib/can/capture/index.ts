/** Capture import and analysis: the public surface used by the server, the UI and the CLI. */
export {
	CANONICAL_HEADER,
	CANONICAL_LAYOUT,
	captureLayoutSchema,
	type CaptureLayout,
	type TimeUnit
} from './layout';
export { CaptureFormatError, detectCaptureLayout, type LayoutGuess } from './detect-layout';
export {
	ingestCapture,
	ingestCaptureInto,
	MAX_REPORTED_BAD_ROWS,
	type BadRow,
	type CaptureSource,
	type IngestOptions,
	type IngestReport
} from './ingest';
export { FrameStore, FLAG_EXTENDED, FLAG_FD, type FrameSink } from './frame-store';
export { decodeChannels, type Channel } from './channels';
export { surveyIds, type IdStatistics, type IdSurvey, type UnknownId } from './id-statistics';
export { loadOverTime, type LoadOverTime } from './load-over-time';
export { scanJ1939, type ActiveTroubleCode, type Dm1Message, type J1939Scan } from './j1939-scan';
export { decodeCapture, type CaptureDecoding, type DecodeCaptureOptions } from './decode-capture';
