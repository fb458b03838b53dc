/**
 * Capture benchmark (`npm run bench`, after the decoding phases; or `npx tsx bench/captures.ts`).
 * Prints figures only; nothing here asserts a timing.
 *
 * Workload (issue 5): a generated capture of 1,000,000 frames in the canonical CSV layout (about
 * 45 MB): 32 standard IDs the map defines (4 signals each: 16-bit big-endian, 16-bit little-endian,
 * 8-bit and a 12-bit unaligned field) and 8 IDs it does not, drawn at random, 10 kHz overall.
 * The route handlers run in this process exactly as the server runs them (a migrated in-memory
 * database, local blob storage in a temporary folder, the capture worker thread):
 *  1. upload: the file streamed as the request body of POST …/captures (stored + layout detected);
 *  2. process: POST …/process with the detected layout, then polling …/status until ready
 *     (parsing in the worker thread, compact frames stored);
 *  3. decode: POST …/decode with r1 of the map → the decoded summary.
 * "Upload request to summary" is 1 + 2 + 3. Then the decimated series of one channel at 2,000
 * points: the first request after the decode (the decode is cached) and the best of 5, and the
 * same after dropping the cache (re-decoded from the stored frames, not the CSV).
 * Peak memory is the process's maximum resident set (worker thread included: one process).
 */
import {
	createReadStream,
	mkdtempSync,
	openSync,
	rmSync,
	statSync,
	writeSync,
	closeSync
} from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Readable } from 'node:stream';
import type { RequestEvent } from '@sveltejs/kit';
import { canMapSchema, type SignalInput } from '../src/lib/can/map';
import { seededRandom } from '../src/lib/can/testing/seeded-random';
import { forgetCaptureDecodes } from '../src/lib/server/captures/decoding';
import { createMap } from '../src/lib/server/maps/maps';
import { publishRevision } from '../src/lib/server/maps/revisions';
import { createWorkspace } from '../src/lib/server/workspaces/workspaces';
import { createLocalStorage } from '../src/lib/server/storage';
import {
	createTestServices,
	createUser,
	makeEvent,
	type TestServices
} from '../src/lib/server/test-support';
import { POST as uploadRoute } from '../src/routes/api/workspaces/[ws]/captures/+server';
import { POST as processRoute } from '../src/routes/api/workspaces/[ws]/captures/[id]/process/+server';
import { GET as statusRoute } from '../src/routes/api/workspaces/[ws]/captures/[id]/status/+server';
import { POST as decodeRoute } from '../src/routes/api/workspaces/[ws]/captures/[id]/decode/+server';
import { GET as seriesRoute } from '../src/routes/api/workspaces/[ws]/captures/[id]/series/+server';

const FRAMES = 1_000_000;
const KNOWN_IDS = 32;
const UNKNOWN_IDS = 8;
const FIRST_ID = 0x100;
const SEED = 0xca97;
const POINTS = 2000;

const signals: SignalInput[] = [
	{ name: 'be16', startBit: 8, length: 16, byteOrder: 'big', scale: 0.1 },
	{ name: 'le16', startBit: 16, length: 16, byteOrder: 'little', valueType: 'signed', scale: 0.01 },
	{ name: 'u8', startBit: 32, length: 8, offset: -40 },
	{ name: 'u12', startBit: 44, length: 12, scale: 0.25 }
];
const map = canMapSchema.parse({
	format: 'framewright-map@1',
	name: 'capture bench',
	frames: Array.from({ length: KNOWN_IDS }, (_, k) => ({
		name: `F${k}`,
		id: FIRST_ID + k,
		cycleMs: 3,
		signals
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

const ms = (s: number) => `${s.toFixed(0)} ms`;
const peakRssMb = () => process.resourceUsage().maxRSS / 1024;

async function main() {
	const dir = mkdtempSync(join(tmpdir(), 'framewright-capture-bench-'));
	try {
		const path = join(dir, 'bench-capture.csv');
		const size = writeCapture(path);
		const rssBefore = peakRssMb();

		const services: TestServices = await createTestServices();
		services.storage = createLocalStorage({ root: join(dir, 'storage') });
		const { db } = services;
		const user = await createUser(db, 'bench@example.test');
		const ws = await createWorkspace(db, { name: 'Bench', ownerId: user.id });
		const created = await createMap(db, {
			workspaceId: ws.id,
			map,
			actorId: user.id,
			source: 'json'
		});
		await publishRevision(db, {
			workspaceId: ws.id,
			mapId: created.id,
			version: 1,
			actorId: user.id,
			note: 'bench'
		});

		const event = (
			routeId: string,
			params: Record<string, string>,
			init: { query?: string; body?: unknown; request?: Request } = {}
		) => {
			const base = makeEvent<RequestEvent>({
				services,
				user,
				routeId,
				params: { ws: ws.slug, ...params },
				body: init.body,
				path:
					routeId.replace(/\[(\w+)\]/g, (_, n: string) => ({ ws: ws.slug, ...params })[n] ?? n) +
					(init.query ?? '')
			});
			return (init.request ? { ...base, request: init.request } : base) as never;
		};
		const API = '/api/workspaces/[ws]/captures';
		const expectOk = async (response: Response, what: string) => {
			if (response.status >= 300)
				throw new Error(`${what} answered ${response.status}: ${await response.text()}`);
			return response.json();
		};

		console.log(
			`\nFramewright capture benchmark: ${FRAMES.toLocaleString('en')} frames, ${(size / 2 ** 20).toFixed(1)} MB CSV, ${KNOWN_IDS} defined IDs × ${signals.length} signals + ${UNKNOWN_IDS} unknown IDs (route handlers in this process)`
		);
		const start = performance.now();
		const body = Readable.toWeb(
			createReadStream(path, { highWaterMark: 1 << 20 })
		) as ReadableStream<Uint8Array>;
		const request = new Request(
			`http://localhost/api/workspaces/${ws.slug}/captures?name=bench-capture.csv`,
			{
				method: 'POST',
				body,
				headers: { 'content-length': String(size), 'content-type': 'text/csv' },
				duplex: 'half'
			} as RequestInit
		);
		const uploaded = await expectOk(
			await uploadRoute(event(API, {}, { query: '?name=bench-capture.csv', request })),
			'upload'
		);
		const id: string = uploaded.capture.id;
		const afterUpload = performance.now();

		await expectOk(
			await processRoute(
				event(`${API}/[id]/process`, { id }, { body: { layout: uploaded.detected.layout } })
			),
			'process'
		);
		for (;;) {
			const status = await expectOk(
				await statusRoute(event(`${API}/[id]/status`, { id })),
				'status'
			);
			if (status.status === 'ready') break;
			if (status.status === 'failed') throw new Error(`processing failed: ${status.error}`);
			await new Promise((resolve) => setTimeout(resolve, 20));
		}
		const afterProcess = performance.now();

		const decoded = await expectOk(
			await decodeRoute(
				event(`${API}/[id]/decode`, { id }, { body: { mapId: created.id, revision: 1 } })
			),
			'decode'
		);
		const afterDecode = performance.now();

		const series = async () => {
			const t = performance.now();
			const body = await expectOk(
				await seriesRoute(
					event(
						`${API}/[id]/series`,
						{ id },
						{ query: `?decode=${decoded.decode.id}&channel=0&points=${POINTS}` }
					)
				),
				'series'
			);
			return { seconds: performance.now() - t, points: body.time.length as number };
		};
		const first = await series();
		let best = Infinity;
		for (let r = 0; r < 5; r++) best = Math.min(best, (await series()).seconds);
		forgetCaptureDecodes(services, id);
		const cold = await series();

		console.log(`  1 upload (stream to storage + layout detection): ${ms(afterUpload - start)}`);
		console.log(
			`  2 process in the worker thread (parse once, store compact frames): ${ms(afterProcess - afterUpload)}`
		);
		console.log(
			`  3 decode with r1 → summary (${decoded.summary.channels.length} channels, ${decoded.summary.unknownIds.length} unknown IDs): ${ms(afterDecode - afterProcess)}`
		);
		console.log(
			`  upload request → decoded summary available (aim < 3 s): ${ms(afterDecode - start)}`
		);
		console.log(
			`  decimated series, ${POINTS} buckets of one channel (${first.points} points; aim < 100 ms): first ${first.seconds.toFixed(1)} ms, best of 5 ${best.toFixed(1)} ms`
		);
		console.log(
			`  the same after dropping the decode cache (re-decoded from stored frames): ${cold.seconds.toFixed(0)} ms`
		);
		console.log(
			`  peak resident memory of this process (aim < 500 MB): ${peakRssMb().toFixed(0)} MB (before the upload: ${rssBefore.toFixed(0)} MB)`
		);
		await db.destroy();
	} finally {
		rmSync(dir, { recursive: true, force: true });
	}
}

main().catch((error) => {
	console.error(error);
	process.exitCode = 1;
});
