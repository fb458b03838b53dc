/**
 * Capture benchmark (`npm run bench -- --frames N`, or `npx tsx bench/captures.ts --frames N`;
 * `npm run bench:large` for 32 M frames). Prints figures only; nothing here asserts a timing.
 *
 * Workload: a generated capture of N frames (default 1,000,000) in the canonical CSV layout, about
 * 40 bytes a frame: 32 standard IDs the map defines (4 signals each: 16-bit big-endian, 16-bit
 * little-endian, 8-bit and a 12-bit unaligned field) and 8 IDs it does not, drawn at random, 10 kHz.
 * The route handlers run in this process exactly as the server runs them (a migrated SQLite file,
 * local blob storage in a temporary folder, the capture worker pool):
 *  1. upload: the file streamed as the request body of POST …/captures;
 *  2. process: POST …/process, then polling …/status until ready (chunked store written by a worker);
 *  3. decode: POST …/decode with r1 → the summary (statistics and pyramids stored by a worker);
 *  4. series windows of one channel at 2,000 points: the whole capture and a 1 % window;
 *     4b. a derived channel over two channels (work/derived.ts): the first request (both channels
 *     decoded from their chunks, the formula evaluated in a worker), then a 1 % window of it;
 *  5. after a restart: a new process (bench/captures-restart.ts) opens the same database and storage
 *     and asks for the summary and two windows (stored decode read back, fresh worker threads).
 * Throughout, a trivial request (GET …/status, one indexed SELECT) is sent every 10 ms and its
 * latency measured from when it was due, so a blocked event loop shows in the figure.
 * With --load (default at 1 M frames), issue 10's scenario: 4 first decodes (r1–r4 of the map on a
 * second copy of the capture) and 2 large exports (long form, wide form at 1 ms) at the same time.
 * Memory: the server's resident set sampled every 50 ms (worker threads live in the same process, so
 * this is the server and its workers together) and the server thread's own JavaScript heap.
 */
import { spawnSync } from 'node:child_process';
import {
	closeSync,
	createReadStream,
	mkdtempSync,
	openSync,
	rmSync,
	statSync,
	writeSync
} from 'node:fs';
import { loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { Readable } from 'node:stream';
import type { RequestEvent } from '@sveltejs/kit';
import { canMapSchema, type CanMap, type SignalInput } from '../src/lib/can/map';
import { seededRandom } from '../src/lib/can/testing/seeded-random';
import { loadConfig } from '../src/lib/server/config';
import { createDatabase, migrateToLatest } from '../src/lib/server/db';
import type { SessionUser } from '../src/lib/server/guard';
import { closeCaptureWorkers } from '../src/lib/server/captures/pool';
import { bundleCaptureWorker } from '../src/lib/server/captures/worker-bundle';
import type { Services } from '../src/lib/server/services';
import { createLocalStorage } from '../src/lib/server/storage';
import { createPublishedMap, createUser, makeEvent } from '../src/lib/server/test-support';
import { createWorkspace } from '../src/lib/server/workspaces/workspaces';
import { POST as uploadRoute } from '../src/routes/api/workspaces/[ws]/captures/+server';
import { POST as processRoute } from '../src/routes/api/workspaces/[ws]/captures/[id]/process/+server';
import { GET as statusRoute } from '../src/routes/api/workspaces/[ws]/captures/[id]/status/+server';
import { POST as decodeRoute } from '../src/routes/api/workspaces/[ws]/captures/[id]/decode/+server';
import { GET as seriesRoute } from '../src/routes/api/workspaces/[ws]/captures/[id]/series/+server';
import { GET as derivedRoute } from '../src/routes/api/workspaces/[ws]/captures/[id]/derived-series/+server';
import { GET as exportRoute } from '../src/routes/w/[ws]/captures/[id]/export/+server';

const argValue = (name: string) => {
	const at = process.argv.indexOf(name);
	return at >= 0 ? process.argv[at + 1] : undefined;
};
const FRAMES = Number(argValue('--frames') ?? 1_000_000);
const LOAD =
	process.argv.includes('--load') || (FRAMES === 1_000_000 && !process.argv.includes('--no-load'));
const KNOWN_IDS = 32;
const UNKNOWN_IDS = 8;
const FIRST_ID = 0x100;
const SEED = 0xca97;
const POINTS = 2000;
/** Two channels of different frames, so the evaluation merges two time bases. */
const DERIVED_FORMULA = '{F0.be16} * 2 + {F1.le16}';

const signals: SignalInput[] = [
	{ name: 'be16', startBit: 8, length: 16, byteOrder: 'big', scale: 0.1 },
	{ name: 'le16', startBit: 16, length: 16, byteOrder: 'little', valueType: 'signed', scale: 0.01 },
	{ name: 'u8', startBit: 32, length: 8, offset: -40 },
	{ name: 'u12', startBit: 44, length: 12, scale: 0.25 }
];
const mapOf = (scale: number): CanMap =>
	canMapSchema.parse({
		format: 'framewright-map@1',
		name: 'capture bench',
		frames: Array.from({ length: KNOWN_IDS }, (_, k) => ({
			name: `F${k}`,
			id: FIRST_ID + k,
			cycleMs: 3,
			signals: signals.map((s, i) => (i === 0 ? { ...s, scale } : s))
		}))
	});

const HEX = Array.from({ length: 256 }, (_, b) => b.toString(16).toUpperCase().padStart(2, '0'));

/** Writes the capture in 1 MiB pieces, so generating it costs this process no memory to speak of. */
function writeCapture(path: string): number {
	const rand = seededRandom(SEED);
	const fd = openSync(path, 'w');
	let text = 'time,id,extended,dlc,data\n';
	for (let i = 0; i < FRAMES; i++) {
		const id = FIRST_ID + rand.int(0, KNOWN_IDS + UNKNOWN_IDS - 1);
		const bytes = rand.bytes(8);
		let data = HEX[bytes[0]];
		for (let b = 1; b < 8; b++) data += ' ' + HEX[bytes[b]];
		text += `${(i * 1e-4).toFixed(6)},${id.toString(16).toUpperCase()},0,8,${data}\n`;
		if (text.length > 1 << 20) {
			writeSync(fd, text);
			text = '';
		}
	}
	writeSync(fd, text);
	closeSync(fd);
	return statSync(path).size;
}

const MB = 1024 * 1024;
const fmtMs = (ms: number) =>
	ms >= 10_000 ? `${(ms / 1000).toFixed(1)} s` : `${ms.toFixed(0)} ms`;

/** Resident set and server-thread heap, sampled every 50 ms; `phase()` returns the peaks since the last call. */
function memoryMonitor() {
	let rss = 0;
	let heap = 0;
	const sample = () => {
		const m = process.memoryUsage();
		rss = Math.max(rss, m.rss);
		heap = Math.max(heap, m.heapUsed);
	};
	const timer = setInterval(sample, 50);
	return {
		phase() {
			sample();
			const out = { rss, heap };
			rss = heap = 0;
			return out;
		},
		stop: () => clearInterval(timer)
	};
}

/** A trivial request every 10 ms, latency from when it was due; `phase()` returns the latencies since the last call. */
function latencyProbe(request: () => Promise<Response>) {
	let latencies: number[] = [];
	let stopped = false;
	let next = performance.now();
	const loop = async () => {
		while (!stopped) {
			const due = next;
			next += 10;
			const wait = due - performance.now();
			if (wait > 0) await new Promise((r) => setTimeout(r, wait));
			void request().then(async (response) => {
				await response.arrayBuffer();
				latencies.push(performance.now() - due);
			});
			if (performance.now() > next) next = performance.now(); // fell behind: no catch-up burst
		}
	};
	void loop();
	return {
		phase() {
			const sorted = latencies.sort((a, b) => a - b);
			latencies = [];
			const q = (p: number) =>
				sorted[Math.min(sorted.length - 1, Math.floor(p * sorted.length))] ?? NaN;
			return { n: sorted.length, p50: q(0.5), p99: q(0.99), max: sorted.at(-1) ?? NaN };
		},
		stop: () => (stopped = true)
	};
}

async function main() {
	const dir = mkdtempSync(join(tmpdir(), 'framewright-capture-bench-'));
	const rows: [string, string, string, string][] = [];
	try {
		const load0 = loadavg()[0];
		const path = join(dir, 'bench-capture.csv');
		const t0 = performance.now();
		const size = writeCapture(path);
		const generated = performance.now() - t0;
		// The production build runs a prebuilt worker; bundle it once here, as `npm run build` does.
		// Inside the project, so its package imports resolve (as build/capture-worker.mjs does).
		const workerFile = join(
			import.meta.dirname,
			'..',
			'node_modules',
			'.cache',
			'framewright',
			`bench-worker-${process.pid}.mjs`
		);
		process.once('exit', () => rmSync(workerFile, { force: true }));
		process.env.FW_CAPTURE_WORKER = workerFile;
		await bundleCaptureWorker(workerFile);

		const dbPath = join(dir, 'bench.db');
		const db = createDatabase(dbPath);
		await migrateToLatest(db);
		const config = loadConfig({ FRAMEWRIGHT_DEMO: '1', CAPTURE_MAX_BYTES: String(8 * 1024 ** 3) });
		const storageRoot = join(dir, 'storage');
		const services: Services = {
			db,
			config,
			sendMail: async () => {},
			storage: createLocalStorage({ root: storageRoot, maxBytes: 32 * 1024 ** 3 })
		};
		const user: SessionUser = await createUser(db, 'bench@example.test');
		const ws = await createWorkspace(db, { name: 'Bench', ownerId: user.id });
		// r1–r4: the same map with the first signal's scale changed, so each decodes anew.
		const created = {
			id: await createPublishedMap(db, {
				workspaceId: ws.id,
				actorId: user.id,
				revisions: [1, 2, 3, 4].map((r) => mapOf(0.1 * r))
			})
		};

		const event = (
			routeId: string,
			params: Record<string, string>,
			init: { query?: string; body?: unknown; request?: Request } = {}
		) => {
			const all: Record<string, string> = { ws: ws.slug, ...params };
			const base = makeEvent<RequestEvent>({
				services,
				user,
				routeId,
				params: all,
				body: init.body,
				path: routeId.replace(/\[(\w+)\]/g, (_, n: string) => all[n] ?? n) + (init.query ?? '')
			});
			return (init.request ? { ...base, request: init.request } : base) as never;
		};
		const API = '/api/workspaces/[ws]/captures';
		const ok = async (response: Response, what: string) => {
			if (response.status >= 300)
				throw new Error(`${what} answered ${response.status}: ${await response.text()}`);
			return response.json();
		};
		const uploadFile = async (name: string) => {
			const body = Readable.toWeb(
				createReadStream(path, { highWaterMark: 1 << 20 })
			) as ReadableStream<Uint8Array>;
			const request = new Request(
				`http://localhost/api/workspaces/${ws.slug}/captures?name=${name}`,
				{
					method: 'POST',
					body,
					headers: { 'content-length': String(size), 'content-type': 'text/csv' },
					duplex: 'half'
				} as RequestInit
			);
			return ok(await uploadRoute(event(API, {}, { query: `?name=${name}`, request })), 'upload');
		};
		const processAndWait = async (id: string, layout: unknown) => {
			await ok(
				await processRoute(event(`${API}/[id]/process`, { id }, { body: { layout } })),
				'process'
			);
			for (;;) {
				const status = await ok(await statusRoute(event(`${API}/[id]/status`, { id })), 'status');
				if (status.status === 'ready') return;
				if (status.status === 'failed') throw new Error(`processing failed: ${status.error}`);
				await new Promise((r) => setTimeout(r, 50));
			}
		};

		console.log(
			`\nFramewright capture benchmark: ${FRAMES.toLocaleString('en')} frames, ${(size / MB).toFixed(0)} MB CSV (generated in ${fmtMs(generated)}), ${KNOWN_IDS} defined IDs × ${signals.length} signals + ${UNKNOWN_IDS} unknown IDs; load average at start ${load0.toFixed(1)} on ${(await import('node:os')).availableParallelism()} cores`
		);
		const memory = memoryMonitor();
		let probeCapture = '';
		const probe = latencyProbe(() =>
			probeCapture
				? statusRoute(event(`${API}/[id]/status`, { id: probeCapture }))
				: Promise.resolve(new Response('{}'))
		);
		const phase = (name: string, ms: number) => {
			const m = memory.phase();
			const p = probe.phase();
			rows.push([
				name,
				fmtMs(ms),
				`${(m.rss / MB).toFixed(0)} MB / ${(m.heap / MB).toFixed(0)} MB`,
				Number.isFinite(p.p99)
					? `${p.p50.toFixed(1)} / ${p.p99.toFixed(1)} / ${p.max.toFixed(0)} ms (${p.n})`
					: '–'
			]);
			console.log(`  ${rows.at(-1)!.join(' | ')}`);
		};
		memory.phase();
		probe.phase();

		const start = performance.now();
		const uploaded = await uploadFile('bench-capture.csv');
		const id: string = uploaded.capture.id;
		probeCapture = id;
		const afterUpload = performance.now();
		phase('1 upload (stream to storage, layout detection)', afterUpload - start);
		await processAndWait(id, uploaded.detected.layout);
		const afterProcess = performance.now();
		phase('2 processing in a worker (chunked store)', afterProcess - afterUpload);
		const decoded = await ok(
			await decodeRoute(
				event(`${API}/[id]/decode`, { id }, { body: { mapId: created.id, revision: 1 } })
			),
			'decode'
		);
		const afterDecode = performance.now();
		phase(
			`3 first decode → summary (${decoded.summary.channels.length} channels, stored)`,
			afterDecode - afterProcess
		);
		rows.push(['upload → summary', fmtMs(afterDecode - start), '', '']);
		console.log(`  ${rows.at(-1)!.join(' | ')}`);

		const series = async (query: string) => {
			const t = performance.now();
			const body = await ok(
				await seriesRoute(
					event(
						`${API}/[id]/series`,
						{ id },
						{ query: `?decode=${decoded.decode.id}&channel=0&points=${POINTS}${query}` }
					)
				),
				'series'
			);
			return { ms: performance.now() - t, points: body.time.length as number };
		};
		const duration = decoded.summary.durationS as number;
		const whole1 = await series('');
		const whole2 = await series('');
		const narrow = await series(`&from=${duration * 0.5}&to=${duration * 0.51}`);
		const tiny = await series(`&from=${duration * 0.3}&to=${duration * 0.3001}`);
		phase(
			`4 series, ${POINTS} points: whole capture first ${whole1.ms.toFixed(0)} ms then ${whole2.ms.toFixed(0)} ms; a 1 % window ${narrow.ms.toFixed(0)} ms; a 0.01 % window ${tiny.ms.toFixed(0)} ms`,
			whole1.ms + whole2.ms + narrow.ms + tiny.ms
		);

		// A derived channel over two channels of different frames (evaluated in a worker from the
		// stored capture): the first request evaluates it, the second is a window of the kept result.
		const derived = async (query: string) => {
			const t = performance.now();
			const body = await ok(
				await derivedRoute(
					event(
						`${API}/[id]/derived-series`,
						{ id },
						{
							query: `?decode=${decoded.decode.id}&formula=${encodeURIComponent(DERIVED_FORMULA)}&points=${POINTS}${query}`
						}
					)
				),
				'derived series'
			);
			return { ms: performance.now() - t, count: body.count as number };
		};
		memory.phase();
		probe.phase();
		const derivedFirst = await derived('');
		const derivedAgain = await derived(`&from=${duration * 0.5}&to=${duration * 0.51}`);
		phase(
			`4b derived series \`${DERIVED_FORMULA}\` (${derivedFirst.count.toLocaleString('en')} samples), ${POINTS} points: whole capture first ${derivedFirst.ms.toFixed(0)} ms (decoding both channels and evaluating); then a 1 % window ${derivedAgain.ms.toFixed(0)} ms`,
			derivedFirst.ms + derivedAgain.ms
		);

		// A real restart: a new process with cold caches and new worker threads.
		const restart = spawnSync(
			process.execPath,
			['--import', 'tsx', join(import.meta.dirname, 'captures-restart.ts')],
			{
				env: {
					...process.env,
					BENCH_DB: dbPath,
					BENCH_STORAGE: storageRoot,
					BENCH_WS: ws.slug,
					BENCH_CAPTURE: id,
					BENCH_DECODE: decoded.decode.id,
					BENCH_USER: JSON.stringify(user),
					BENCH_DURATION: String(duration)
				},
				encoding: 'utf8'
			}
		);
		if (restart.status !== 0) throw new Error(`restart process failed: ${restart.stderr}`);
		const r = JSON.parse(restart.stdout.trim().split('\n').at(-1)!);
		rows.push([
			`5 after a restart (new process): summary ${r.summaryMs.toFixed(0)} ms; whole-capture window ${r.firstMs.toFixed(0)} ms (incl. starting the worker thread); a 1 % window ${r.narrowMs.toFixed(0)} ms; another ${r.secondMs.toFixed(0)} ms`,
			'',
			`${r.peakRssMb.toFixed(0)} MB`,
			''
		]);
		console.log(`  ${rows.at(-1)!.join(' | ')}`);

		if (LOAD) {
			// Issue 10: 4 first decodes and 2 large exports of a 1 M-frame capture at once.
			const copy = await uploadFile('bench-copy.csv');
			await processAndWait(copy.capture.id, copy.detected.layout);
			memory.phase();
			probe.phase();
			const t = performance.now();
			const drain = async (response: Response) => {
				let bytes = 0;
				for await (const chunk of response.body as unknown as AsyncIterable<Uint8Array>)
					bytes += chunk.byteLength;
				return bytes;
			};
			const exportOf = async (query: string) =>
				drain(
					(await exportRoute(event('/w/[ws]/captures/[id]/export', { id }, { query }))) as Response
				);
			const [, , , , longBytes, wideBytes] = await Promise.all([
				...[1, 2, 3, 4].map((revision) =>
					decodeRoute(
						event(
							`${API}/[id]/decode`,
							{ id: copy.capture.id },
							{ body: { mapId: created.id, revision } }
						)
					).then((res) => ok(res, 'decode'))
				),
				exportOf(`?kind=long&decode=${decoded.decode.id}`),
				exportOf(`?kind=wide&decode=${decoded.decode.id}&interval=0.001&mode=mean`)
			]);
			phase(
				`6 issue 10: 4 first decodes + 2 exports (long ${(longBytes / MB).toFixed(0)} MB, wide ${(wideBytes / MB).toFixed(0)} MB) at once`,
				performance.now() - t
			);
		}
		probe.stop();
		memory.stop();
		console.log(
			`\n| phase | time | peak RSS (server + workers) / server-thread heap | trivial request p50 / p99 / max (n) |\n|---|---|---|---|`
		);
		for (const row of rows) console.log(`| ${row.join(' | ')} |`);
		console.log(
			`\nPeak resident set of this process overall: ${(process.resourceUsage().maxRSS / 1024).toFixed(0)} MB; load average now ${loadavg()[0].toFixed(1)}.`
		);
		await closeCaptureWorkers();
		await db.destroy();
	} finally {
		rmSync(dir, { recursive: true, force: true });
	}
}

main().catch((error) => {
	console.error(error);
	process.exitCode = 1;
});
