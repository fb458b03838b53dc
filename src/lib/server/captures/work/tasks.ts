/**
 * The work a capture worker thread does (capture-worker.ts runs it; pool.ts sends it). Every task
 * names the store by its plain-data settings, so the worker opens the same storage itself and the
 * server thread only passes keys, never frames.
 */
import type { CaptureReport } from '../../../api/captures';
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

/** What a decode keeps in storage (`summary.json`), enough to answer every view without decoding again. */
export interface StoredDecode {
	format: 'framewright-decode@1';
	summary: DecodeSummary;
	channels: {
		firstTime: number | null;
		lastTime: number | null;
		/** Byte range of the channel's pyramid in `pyramids.fwcp`. */
		pyramidOffset: number;
		pyramidBytes: number;
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

export type CaptureTask =
	| ProcessTask
	| ConvertTask
	| DecodeTask
	| SeriesTask
	| SamplesTask
	| AlertsTask
	| ReceiverTask
	| ExportTask
	| BusLoadTask;
