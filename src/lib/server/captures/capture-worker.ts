/**
 * The capture worker thread's entry (run by the pool in pool.ts): parses captures into the chunked
 * store, decodes, answers series windows and derived channels, replays alert rules and produces
 * exports, so none of that CPU work runs on the server's event loop. Each task names its storage by plain-data settings and
 * the worker opens it itself. Bundled with esbuild: at build time into the build folder, on demand
 * in development and tests (worker-bundle.ts).
 */
import type { MessagePort } from 'node:worker_threads';
import { storageFromSettings } from '../storage/settings';
import type { BlobStorage, StorageSettings } from '../storage/storage';
import { runAlerts, runSamples } from './work/alerts';
import { runReceiver } from './work/receivers';
import { runBusLoad } from './work/bus-load';
import { runDecode, runDecodePart } from './work/decode';
import { runDerived, runDerivedExport } from './work/derived';
import { runExport } from './work/export';
import { runCorrelate, runFields } from './work/fields';
import { runConvert, runProcess } from './work/process';
import { runSeries } from './work/series';
import type { CaptureTask } from './work/tasks';

const stores = new Map<string, Promise<BlobStorage>>();

function storageFor(settings: StorageSettings): Promise<BlobStorage> {
	const key = JSON.stringify(settings);
	let store = stores.get(key);
	if (!store) stores.set(key, (store = storageFromSettings(settings)));
	return store;
}

export default async function run(task: CaptureTask): Promise<unknown> {
	const storage = await storageFor(task.storage);
	switch (task.kind) {
		case 'process': {
			const progress = task.progress as unknown as MessagePort | undefined;
			try {
				return await runProcess(storage, task, (bytes) => progress?.postMessage({ bytes }));
			} finally {
				progress?.close();
			}
		}
		case 'convert':
			return runConvert(storage, task);
		case 'decode':
			return runDecode(storage, task);
		case 'decode-part':
			return runDecodePart(storage, task);
		case 'series':
			return runSeries(storage, task);
		case 'samples':
			return runSamples(storage, task);
		case 'alerts':
			return runAlerts(storage, task);
		case 'receiver':
			return runReceiver(storage, task);
		case 'fields':
			return runFields(storage, task);
		case 'correlate':
			return runCorrelate(storage, task);
		case 'export':
			return runExport(storage, { ...task, port: task.port as unknown as MessagePort });
		case 'bus-load':
			return runBusLoad(storage, task);
		case 'derived':
			return runDerived(storage, task);
		case 'derived-export':
			return runDerivedExport(storage, { ...task, port: task.port as unknown as MessagePort });
	}
}
