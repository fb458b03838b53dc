/**
 * The pools of capture worker threads (piscina), so CPU work over captures never runs on the
 * server's event loop: parsing, first decodes, exports and alert replays in the `heavy` pool, series
 * windows in a small `interactive` pool of their own so a plot never waits behind a long decode.
 * Workers run at a lower scheduling priority (nice) than the server thread, which then keeps
 * answering pages while every core decodes. Sizes: CAPTURE_WORKERS (default: the machine's cores).
 */
import { availableParallelism } from 'node:os';
import type { TransferListItem } from 'node:worker_threads';
import { Piscina } from 'piscina';
import { captureWorkerPath } from './worker-bundle';
import type { CaptureTask } from './work/tasks';

interface Pools {
	heavy: Piscina;
	interactive: Piscina;
}

let pools: Promise<Pools> | null = null;
let configuredWorkers: number | null = null;

/** Sets the heavy pool's size (CAPTURE_WORKERS, read by config.ts); null = one per core. */
export function configureCaptureWorkers(workers: number | null): void {
	configuredWorkers = workers;
}

function workerCount(): number {
	return configuredWorkers ?? Math.max(1, availableParallelism());
}

/** Threads of the heavy pool: how many parts a large first decode is split into. */
export function captureWorkerCount(): number {
	return workerCount();
}

type LoadBalancer = NonNullable<
	NonNullable<ConstructorParameters<typeof Piscina>[0]>['loadBalancer']
>;

/**
 * An idle thread first; while the pool may still grow, a new thread rather than a busy one (so the
 * parts of a split decode run side by side, not one after the other on a warm thread); only then
 * the least busy thread with room. (Piscina's own balancer gives a second task to a busy thread
 * before starting another.)
 */
export function spreadingBalancer(maxThreads: number, tasksPerThread: number): LoadBalancer {
	return (task, workers) => {
		let best: (typeof workers)[number] | null = null;
		for (const worker of workers) {
			if (worker.currentUsage === 0) return worker;
			if (worker.isRunningAbortableTask || task.isAbortable) continue;
			if (worker.currentUsage < (best?.currentUsage ?? tasksPerThread)) best = worker;
		}
		return workers.length < maxThreads ? null : best;
	};
}

function createPools(): Promise<Pools> {
	return captureWorkerPath().then((filename) => {
		const common = {
			filename,
			minThreads: 0,
			// Idle workers end (and give their memory back) after a minute.
			idleTimeout: 60_000,
			// A task waiting on storage or on a slow download leaves its thread to others.
			concurrentTasksPerWorker: 4
		};
		const heavy = new Piscina({
			...common,
			maxThreads: workerCount(),
			niceIncrement: 10,
			loadBalancer: spreadingBalancer(workerCount(), common.concurrentTasksPerWorker)
		});
		// One interactive thread kept ready, so a plot after a restart does not wait for a thread to start.
		const interactive = new Piscina({
			...common,
			minThreads: 1,
			maxThreads: 1,
			idleTimeout: Infinity,
			niceIncrement: 5
		});
		// A worker that fails outside a task (e.g. cannot load) must not end the server: the task
		// that needed it fails with the error, and this says why.
		for (const pool of [heavy, interactive])
			pool.on('error', (error: unknown) =>
				console.error(
					`A capture worker failed: ${error instanceof Error ? error.message : String(error)}`
				)
			);
		return { heavy, interactive };
	});
}

function getPools(): Promise<Pools> {
	pools ??= createPools().catch((error: unknown) => {
		pools = null;
		throw error;
	});
	return pools;
}

/** Starts the pools now (at server start) rather than at the first capture task. */
export function startCaptureWorkers(): void {
	getPools().catch((error: unknown) =>
		console.error(
			`The capture workers could not start: ${error instanceof Error ? error.message : String(error)}`
		)
	);
}

let heavyTasks = 0;

/** Tasks sent to the heavy pool and not finished yet (running or queued). */
export function heavyTasksInFlight(): number {
	return heavyTasks;
}

/** Runs a task on a worker; `interactive` for short answers a person waits for (series windows). */
export async function runCaptureTask<T>(
	task: CaptureTask,
	options: { interactive?: boolean; signal?: AbortSignal; transferList?: TransferListItem[] } = {}
): Promise<T> {
	const { heavy, interactive } = await getPools();
	const run = () =>
		(options.interactive ? interactive : heavy).run(task, {
			signal: options.signal,
			transferList: options.transferList
		}) as Promise<T>;
	if (options.interactive) return run();
	heavyTasks++;
	try {
		return await run();
	} finally {
		heavyTasks--;
	}
}

/** Ends the worker threads (at shutdown; tasks still running are stopped). */
export async function closeCaptureWorkers(): Promise<void> {
	const current = pools;
	pools = null;
	if (!current) return;
	const { heavy, interactive } = await current.catch(() => ({ heavy: null, interactive: null }));
	await Promise.all([heavy?.destroy(), interactive?.destroy()]);
}
