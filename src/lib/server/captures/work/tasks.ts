/**
 * The work a capture worker thread does (capture-worker.ts runs it; pool.ts sends it). Every task
 * names the store by its plain-data settings, so the worker opens the same storage itself and the
 * server thread only passes keys, never frames.
 */
import type { CaptureReport } from '../../../api/captures';
import type { Issue } from '../../../api/problem';
import type {
	DerivedDefinition,
	DerivedSeriesResponse,
	SpanResponse
} from '../../../api/workbench';
import type {
	CaptureBusLoadResponse,
	DecodeSummary,
	SeriesResponse
} from '../../../api/capture-views';
import type { AlertReplay } from '../../../can/alerts/replay';
import type { CaptureOrigin } from '../../../can/capture/clock';
import type { CaptureLayout } from '../../../can/capture/layout';
import type { ResampleMode } from '../../../can/capture/export';
import type { CanMap } from '../../../can/map';
import type { CandidateField, FieldCorrelation } from '../../../can/fields/correlate';
import type { IdProposals } from '../../../can/fields/proposal';
import type { CaptureCheck } from '../../../can/receivers/check';
import type { Link } from '../../../can/receivers/linking';
import type { ReceiverProfile } from '../../../can/receivers/profile';
import type { StorageSettings } from '../../storage/storage';

interface OnStore {
	storage: StorageSettings;
}

export interface ProcessTask extends OnStore {
	kind: 'process';
	rawKey: string;
	layout: CaptureLayout;
	storeFolder: string;
	segmentFrames?: number;
	/** Receives `{ bytes }` (bytes of the file read so far) as parsing goes. */
	progress?: MessagePort;
}

export type ProcessOutcome =
	| {
			ok: true;
			report: CaptureReport;
			frameCount: number;
			durationS: number;
			indexKey: string;
			threadId: number;
	  }
	/** `formatError`: the file could not be read as a capture (a message for the person). */
	| { ok: false; formatError: boolean; message: string; threadId: number };

export interface ConvertTask extends OnStore {
	kind: 'convert';
	legacyKey: string;
	storeFolder: string;
}

export interface DecodeTask extends OnStore {
	kind: 'decode';
	indexKey: string;
	map: CanMap;
	/** Where the decode's statistics and pyramids go (capture-store.ts, decodeFolder). */
	folder: string;
}

/** Part `part` of a first decode split into `parts` (work/decode.ts, runDecodePart). */
export interface DecodePartTask extends Omit<DecodeTask, 'kind'> {
	kind: 'decode-part';
	part: number;
	parts: number;
}

/** What one part of a split decode gives back; its pyramids are stored in `pyramids-<part>.fwcp`. */
export interface DecodePartOutcome {
	part: number;
	/** Whether this part has the bus figures (ID survey, bus load, J1939) of the summary. */
	bus: boolean;
	/** The channels this part decoded: their entries of `summary` and `channels` are the real ones. */
	owned: number[];
	summary: DecodeSummary;
	channels: StoredDecode['channels'];
	/** The worker thread that decoded it (tests check that parts run side by side). */
	threadId: number;
}

/** What a decode keeps in storage (`summary.json`), enough to answer every view without decoding again. */
export interface StoredDecode {
	format: 'framewright-decode@1';
	summary: DecodeSummary;
	channels: {
		firstTime: number | null;
		lastTime: number | null;
		/** Byte range of the channel's pyramid in `pyramids.fwcp` (`pyramids-<part>.fwcp` with a part). */
		pyramidOffset: number;
		pyramidBytes: number;
		/** The part of a split decode that stored the pyramid (absent: one pass, one file). */
		pyramidPart?: number;
	}[];
}

interface OnDecode extends OnStore {
	indexKey: string;
	map: CanMap;
	folder: string;
}

export interface SeriesTask extends OnDecode {
	kind: 'series';
	channel: number;
	from: number;
	to: number;
	points: number;
	pyramidOffset: number;
	pyramidBytes: number;
	pyramidPart?: number;
}

export type SeriesOutcome = Omit<SeriesResponse, 'channel'>;

export interface SamplesTask extends OnDecode {
	kind: 'samples';
	channel: number;
}

export interface AlertsTask extends OnDecode {
	kind: 'alerts';
	duration: number;
	acknowledgements: { ruleId: string; time: number }[];
}

export type AlertsOutcome = AlertReplay;

/**
 * A receiver profile on a decode: the installer's checklist of its linked channels, or its device
 * alert rules replayed (src/lib/can/receivers/). Only the linked channels are decoded.
 */
export interface ReceiverTask extends OnDecode {
	kind: 'receiver';
	what: 'check' | 'alerts';
	profile: ReceiverProfile;
	links: Link[];
	duration: number;
	acknowledgements: { ruleId: string; time: number }[];
}

export type ReceiverOutcome = CaptureCheck | AlertReplay;

/** A request refused with a message for the person (the server answers 400 with it). */
export interface FormulaRefusal {
	message: string;
	issues?: Issue[];
}

/**
 * A derived channel (docs/derived-channels.md) evaluated in a worker over the channels its formula
 * names: a decimated window of it, or a span's statistics, histogram and XY pairs against `versus`.
 */
export interface DerivedTask extends OnDecode {
	kind: 'derived';
	query:
		| { what: 'series'; formula: string; from: number; to: number; points: number }
		| {
				what: 'span';
				formula: string;
				versus: string | null;
				from: number;
				to: number;
				above: number | undefined;
				bins: number;
		  };
}

export type DerivedOutcome =
	| { ok: true; series: DerivedSeriesResponse }
	| { ok: true; span: SpanResponse }
	| { ok: false; refusal: FormulaRefusal };

/** The decode's channels and derived ones as one CSV, streamed like ExportTask. */
export interface DerivedExportTask extends OnDecode {
	kind: 'derived-export';
	exportKind: 'long' | 'wide';
	derived: DerivedDefinition[];
	interval: number;
	mode: ResampleMode;
	/** Carries the stream (export-stream.ts). */
	port: MessagePort;
}

export type ExportKind = 'frames' | 'long' | 'wide';

export interface ExportTask extends OnStore {
	kind: 'export';
	indexKey: string;
	exportKind: ExportKind;
	map: CanMap | null;
	interval: number;
	mode: ResampleMode;
	channelTimes: StoredDecode['channels'];
	/** The capture's clock origin: with one, every export gets a `clock` column. */
	origin?: CaptureOrigin;
	/** Carries the stream (export-stream.ts). */
	port: MessagePort;
}

/** A capture's bus load per bus at the given bit rates (work/bus-load.ts). */
export interface BusLoadTask extends OnStore {
	kind: 'bus-load';
	indexKey: string;
	bitrate: number;
	dataBitrate: number | null;
}

export type BusLoadOutcome = Omit<CaptureBusLoadResponse, 'bitrate'>;

/** Field proposals (docs/field-proposals.md) for these IDs, read from their chunks only. */
export interface FieldsTask extends OnStore {
	kind: 'fields';
	indexKey: string;
	ids: { id: number; extended: boolean }[];
}

export type FieldsOutcome = IdProposals[];

/** A decoded channel against candidate fields of unknown IDs (work/fields.ts). */
export interface CorrelateTask extends OnDecode {
	kind: 'correlate';
	channel: number;
	candidates: CandidateField[];
	/** Most scatter points of the best match. */
	maxPoints: number;
	/** Rows of the ranking kept. */
	top: number;
}

export interface CorrelateOutcome {
	ranking: Omit<FieldCorrelation, 'scatter'>[];
	/** The best match's pairs (empty without one). */
	scatter: { raw: number[]; channel: number[] };
}

export type CaptureTask =
	| FieldsTask
	| CorrelateTask
	| ProcessTask
	| ConvertTask
	| DecodeTask
	| DecodePartTask
	| SeriesTask
	| SamplesTask
	| AlertsTask
	| ReceiverTask
	| ExportTask
	| BusLoadTask
	| DerivedTask
	| DerivedExportTask;
