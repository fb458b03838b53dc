/**
 * Follows a capture's processing by polling its status route until it is ready or failed. Processing
 * runs in a worker on the server, so the page only asks now and then; a transient network error
 * does not end the watch, but repeated ones do, with the last error.
 */
import type { CaptureStatus, CaptureStatusResponse as StatusAnswer } from '$lib/api/captures';

export type { StatusAnswer };

export interface PollOptions {
	onupdate?: (answer: StatusAnswer) => void;
	intervalMs?: number;
	/** Consecutive failed requests tolerated before giving up. */
	maxFailures?: number;
	signal?: AbortSignal;
	sleep?: (ms: number) => Promise<void>;
}

const wait = (ms: number) => new Promise<void>((resolve) => setTimeout(resolve, ms));

export const isSettled = (status: CaptureStatus) => status === 'ready' || status === 'failed';

/** Resolves with the settled answer; rejects with the last error after too many failures, or on abort. */
export async function pollUntilSettled(
	getStatus: () => Promise<StatusAnswer>,
	options: PollOptions = {}
): Promise<StatusAnswer> {
	const { intervalMs = 800, maxFailures = 5, sleep = wait } = options;
	let failures = 0;
	for (;;) {
		if (options.signal?.aborted) throw new Error('Stopped following the processing.');
		try {
			const answer = await getStatus();
			failures = 0;
			options.onupdate?.(answer);
			// 'uploaded' after a process request means the server has not picked it up yet: keep asking.
			if (isSettled(answer.status)) return answer;
		} catch (error) {
			if (++failures >= maxFailures) throw error;
		}
		await sleep(intervalMs);
	}
}

/** "42 %" for a 0–1 fraction, clamped. */
export const percentText = (fraction: number) =>
	`${Math.round(Math.min(1, Math.max(0, fraction)) * 100)} %`;
