/**
 * What the server closes when it stops (SIGTERM, SIGINT: Ctrl+C, a service manager, a container
 * stop). Parts that hold something open — the database, the stand-in SMTP server, worker threads,
 * processing in flight — register a close function here; `shutdown()` runs them newest first (so
 * the database, opened first, closes last), each given at most `timeoutMs`, and never throws.
 *
 * adapter-node stops accepting connections on the signal, lets running requests finish (up to
 * SHUTDOWN_TIMEOUT seconds, which `npm start` sets to 5) and then emits `sveltekit:shutdown`, which
 * `startup.ts` answers with `shutdown()`; `scripts/serve.js` ends the process within 10 s whatever
 * happens.
 */

export type CloseFunction = () => Promise<void> | void;

interface Closer {
	name: string;
	close: CloseFunction;
}

// On globalThis so Vite's module reloading in development keeps one registry.
const key = Symbol.for('framewright.shutdown');
type Holder = { [key]?: { closers: Closer[]; done: Promise<void> | null } };

function registry() {
	const holder = globalThis as Holder;
	return (holder[key] ??= { closers: [], done: null });
}

/** Registers a close function; returns a function that unregisters it (for parts closed earlier). */
export function onShutdown(name: string, close: CloseFunction): () => void {
	const closer = { name, close };
	registry().closers.push(closer);
	return () => {
		const { closers } = registry();
		const at = closers.indexOf(closer);
		if (at >= 0) closers.splice(at, 1);
	};
}

/**
 * Runs every registered close function, newest first, once (later calls wait for the first).
 * A close that fails or takes longer than `timeoutMs` is logged and the next one runs.
 */
export function shutdown(
	options: { timeoutMs?: number; log?: (line: string) => void } = {}
): Promise<void> {
	const state = registry();
	state.done ??= (async () => {
		const { timeoutMs = 5000, log = console.log } = options;
		const closers = state.closers.splice(0).reverse();
		for (const { name, close } of closers) {
			let timer: NodeJS.Timeout | undefined;
			const late = new Promise<'late'>((resolve) => {
				timer = setTimeout(() => resolve('late'), timeoutMs);
			});
			try {
				const outcome = await Promise.race([Promise.resolve().then(close), late]);
				if (outcome === 'late') log(`Stopping: ${name} did not close within ${timeoutMs} ms`);
			} catch (error) {
				log(`Stopping: closing ${name} failed: ${error instanceof Error ? error.message : error}`);
			} finally {
				clearTimeout(timer);
			}
		}
	})();
	return state.done;
}

/** Forgets every close function and a finished shutdown (tests only). */
export function resetShutdownForTests(): void {
	const state = registry();
	state.closers.length = 0;
	state.done = null;
}
