/** Messages between the server and the capture worker thread (structured clone; buffers transferred). */
import type { IngestReport } from '../../can/capture/ingest';

export type ToWorker = { type: 'chunk'; bytes: Uint8Array } | { type: 'end' };

export type FromWorker =
	| { type: 'consumed'; bytes: number }
	| { type: 'done'; report: IngestReport; durationS: number; store: Uint8Array; threadId: number }
	| { type: 'failed'; message: string; formatError: boolean; threadId: number };
