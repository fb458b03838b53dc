/**
 * The "after a restart" part of bench/captures.ts, run by it as a new process: opens the same
 * database and storage with cold caches and new worker threads, then times the decode summary and
 * series windows. Prints one JSON line.
 */
import type { RequestEvent } from '@sveltejs/kit';
import { closeCaptureWorkers, startCaptureWorkers } from '../src/lib/server/captures/pool';
import { loadConfig } from '../src/lib/server/config';
import { createDatabase } from '../src/lib/server/db';
import type { Services } from '../src/lib/server/services';
import { createLocalStorage } from '../src/lib/server/storage';
import { makeEvent } from '../src/lib/server/test-support';
import { GET as decodesRoute } from '../src/routes/api/workspaces/[ws]/captures/[id]/decodes/[decodeId]/+server';
import { GET as seriesRoute } from '../src/routes/api/workspaces/[ws]/captures/[id]/series/+server';

const env = process.env;
const db = createDatabase(env.BENCH_DB!);
const services: Services = {
	db,
	config: loadConfig({ FRAMEWRIGHT_DEMO: '1' }),
	sendMail: async () => {},
	storage: createLocalStorage({ root: env.BENCH_STORAGE!, maxBytes: 32 * 1024 ** 3 })
};
const user = JSON.parse(env.BENCH_USER!);
const params = { ws: env.BENCH_WS!, id: env.BENCH_CAPTURE!, decodeId: env.BENCH_DECODE! };
const duration = Number(env.BENCH_DURATION);
const event = (routeId: string, query = '') =>
	makeEvent<RequestEvent>({
		services,
		user,
		routeId,
		params,
		path:
			routeId.replace(/\[(\w+)\]/g, (_, n: string) => params[n as keyof typeof params] ?? n) + query
	}) as never;
const timed = async (run: () => Promise<Response>) => {
	const t = performance.now();
	const response = await run();
	if (response.status !== 200) throw new Error(`${response.status}: ${await response.text()}`);
	await response.json();
	return performance.now() - t;
};
const API = '/api/workspaces/[ws]/captures/[id]';
const series = (query: string) =>
	timed(() =>
		seriesRoute(event(`${API}/series`, `?decode=${params.decodeId}&channel=0&points=2000${query}`))
	);

// As the server does at start (startup.ts); then a moment, as a server is up before the first plot.
startCaptureWorkers();
await new Promise((r) => setTimeout(r, 2000));
const summaryMs = await timed(() => decodesRoute(event(`${API}/decodes/[decodeId]`)));
const firstMs = await series('');
const narrowMs = await series(`&from=${duration * 0.2}&to=${duration * 0.21}`);
const secondMs = await series(`&from=${duration * 0.7}&to=${duration * 0.9}`);
await closeCaptureWorkers();
await db.destroy();
console.log(
	JSON.stringify({
		summaryMs,
		firstMs,
		narrowMs,
		secondMs,
		peakRssMb: process.resourceUsage().maxRSS / 1024
	})
);
