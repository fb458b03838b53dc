/**
 * Storage hygiene at start and while running: what interrupted uploads and processing left behind
 * in storage (a local `.incoming/*.part` temporary file after a `kill -9` mid-upload, an S3
 * multipart upload never completed) is removed once nothing has written to it for a while.
 */
import type { BlobStorage } from '../storage/storage';

/** At start: anything idle this long is not being written by a live upload. */
const START_IDLE_MS = 60_000;
/** While running: an upload that wrote nothing for an hour is dead (a live one writes continuously). */
const RUNNING_IDLE_MS = 60 * 60_000;
const SWEEP_EVERY_MS = 10 * 60_000;

/** Sweeps now and then every ten minutes (the timer never keeps the process alive); returns a stop function. */
export function sweepStorage(storage: BlobStorage): () => void {
	const sweep = (idleMs: number) =>
		storage.sweepIncomplete(idleMs).then(
			(n) => {
				if (n > 0)
					console.log(`Storage: removed ${n} unfinished upload(s) left by an interruption.`);
			},
			(error: unknown) =>
				console.error(
					`Storage sweep failed: ${error instanceof Error ? error.message : String(error)}`
				)
		);
	void sweep(START_IDLE_MS);
	const timer = setInterval(() => void sweep(RUNNING_IDLE_MS), SWEEP_EVERY_MS);
	timer.unref();
	return () => clearInterval(timer);
}
