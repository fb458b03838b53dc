/**
 * Decoding benchmark (`npm run bench`). Prints figures only; nothing here asserts a timing.
 *
 * Workload (issue 2): 1,000,000 frames over 40 standard IDs, 5 signals each (200 signals): three
 * byte-aligned fields (16-bit little-endian, 16-bit big-endian signed, 8-bit) and two unaligned ones
 * (12 and 11 bits). Payloads are seeded random bytes; the IDs are drawn at random, so the decoder
 * cannot rely on runs of one ID.
 *
 * What each comparison means — decided so that both sides do the same job:
 *  (a) decode only, from the in-memory frame store.
 *      a1 "extraction": one frame definition applied to every payload, no ID lookup — the compiled
 *         frame decoder against DataView reading the same three byte-aligned fields.
 *      a2 "dispatching" (THE AIM, within 2×): what a decoder really does for each received frame —
 *         find the frame's definition from its ID (and extended flag), check the payload is long
 *         enough, read its fields and store them in that frame's output slots. The hand-written
 *         DataView baseline gets the best a person would write for this map: a dense table from
 *         11-bit ID to slot, one length check per frame and one straight-line body (all 40 frames
 *         share a layout here, which favours the baseline: a real map needs one body per frame).
 *      a3 "bare" (for reference only): the first baseline of this bench — slot = id − 0x100, no
 *         table, no length check. No real decoder can know its IDs are contiguous, so the aim does
 *         not refer to it; it shows the cost of dispatch itself.
 *  (b) CSV ingest + decode against papaparse alone, on the same file streamed from disk in the same
 *      1 MiB chunks (read, UTF-8 decode, cut at whole lines, papaparse's streaming Parser). The aim
 *      is that our row reading, frame storing and decoding to channels add under 25 %.
 *      Two ingest routes are timed: the default, where strictly canonical lines are read in place
 *      and only other lines go through papaparse (so it can beat papaparse alone — it skips the
 *      per-field strings), and the general route with every line through papaparse
 *      (`canonicalFastPath: false`), which is what "papaparse + our work" costs for any other layout.
 *  (c) peak resident memory of ingest + decode from that streamed file, measured in a child process
 *      of its own (nothing else is alive in it); papaparse's own peaks are printed beside it.
 * Every phase runs in a fresh child process (`tsx bench/run.ts --phase NAME`), so one phase's heap
 * and JIT state never colour another's, and each timing is the best of a few runs where the phase
 * allows repeating; a busy machine still skews the figures, so compare ratios from one run.
 */
import { spawnSync } from 'node:child_process';
import { createReadStream, mkdtempSync, rmSync, writeFileSync, appendFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import Papa from 'papaparse';
import { papaparseRows } from './papaparse-alone';
import { decodeChannels } from '../src/lib/can/capture/channels';
import { FLAG_EXTENDED, FrameStore } from '../src/lib/can/capture/frame-store';
import { ingestCapture } from '../src/lib/can/capture/ingest';
import { compileMap, type CompiledMap } from '../src/lib/can/decoder';
import { canMapSchema, MAX_STANDARD_ID, type SignalInput } from '../src/lib/can/map';
import { seededRandom } from '../src/lib/can/testing/seeded-random';

const FRAMES = 1_000_000;
const IDS = 40;
const FIRST_ID = 0x100;
const SEED = 0xbe7c4;
const CHUNK_BYTES = 1 << 20;
/** Processes per streamed phase. */
const RUNS = 3;

const aligned: SignalInput[] = [
	{ name: 'le16', startBit: 0, length: 16, byteOrder: 'little', scale: 0.1, offset: -5 },
	{ name: 'be16', startBit: 24, length: 16, byteOrder: 'big', valueType: 'signed', scale: 0.01 },
	{ name: 'u8', startBit: 32, length: 8, offset: -40 }
];
const unaligned: SignalInput[] = [
	{ name: 'u12', startBit: 40, length: 12, scale: 0.25 },
	{ name: 'u11', startBit: 52, length: 11, byteOrder: 'little', scale: 0.5, offset: 10 }
];
/** Bytes the aligned fields need: the baseline's one length check. */
const ALIGNED_BYTES = 5;

const mapWith = (signals: SignalInput[]) =>
	canMapSchema.parse({
		format: 'framewright-map@1',
		name: 'bench',
		frames: Array.from({ length: IDS }, (_, k) => ({
			name: `F${k}`,
			id: FIRST_ID + k,
			cycleMs: 10,
			signals
		}))
	});

/** The generated capture, frame by frame (the same sequence for the store and for the CSV file). */
function* generatedFrames(): Generator<{ time: number; id: number; data: Uint8Array }> {
	const rand = seededRandom(SEED);
	for (let i = 0; i < FRAMES; i++)
		yield { time: i * 1e-4, id: FIRST_ID + rand.int(0, IDS - 1), data: rand.bytes(8) };
}

function makeStore(): FrameStore {
	const store = new FrameStore();
	for (const f of generatedFrames()) store.add(f.time, f.id, false, f.data, 8);
	return store;
}

const hex2 = Array.from({ length: 256 }, (_, b) => b.toString(16).padStart(2, '0'));

function writeCsv(path: string): number {
	writeFileSync(path, 'time,id,extended,dlc,data\n');
	let bytes = 0;
	let text = '';
	for (const f of generatedFrames()) {
		text += `${f.time.toFixed(6)},${f.id.toString(16)},0,8,${Array.from(f.data, (b) => hex2[b]).join(' ')}\n`;
		if (text.length >= CHUNK_BYTES) {
			appendFileSync(path, text);
			bytes += text.length;
			text = '';
		}
	}
	appendFileSync(path, text);
	return bytes + text.length;
}

const seconds = (run: () => unknown) => {
	const start = performance.now();
	run();
	return (performance.now() - start) / 1000;
};
/** Best of `runs` after one warm-up run, so the JIT has compiled the path and a busy moment is skipped. */
const best = (run: () => unknown, runs = 5) => {
	run();
	return Math.min(...Array.from({ length: runs }, () => seconds(run)));
};
const peakRssMb = () => process.resourceUsage().maxRSS / 1024;

// ---------- (a) decode only ----------

let sink = 0; // every loop adds a value into this, so no work can be dropped as dead

/** a1: one compiled frame decoder over every payload. */
function extractCompiled(store: FrameStore, compiled: CompiledMap, out: Float64Array): void {
	const frame = compiled.frames[0];
	const { dataOffset, length, data } = store;
	for (let i = 0; i < store.count; i++) frame.decode(data, dataOffset[i], length[i], out, 0);
	sink += out[0];
}

/** a1 baseline: the same three fields by DataView. */
function extractDataView(store: FrameStore, out: Float64Array): void {
	const { dataOffset, data } = store;
	const view = new DataView(data.buffer, data.byteOffset, data.byteLength);
	for (let i = 0; i < store.count; i++) {
		const at = dataOffset[i];
		out[0] = view.getUint16(at, true) * 0.1 - 5;
		out[1] = view.getInt16(at + 2, false) * 0.01;
		out[2] = view.getUint8(at + 4) - 40;
	}
	sink += out[0];
}

/** a2 and the full decode: the compiled map's own lookup and dispatch, as decodeChannels uses them. */
function decodeDispatching(store: FrameStore, compiled: CompiledMap, out: Float64Array): void {
	const { id, flags, length, dataOffset, data } = store;
	const { frames } = compiled;
	for (let i = 0; i < store.count; i++) {
		const f = compiled.indexOf(id[i], (flags[i] & FLAG_EXTENDED) !== 0);
		if (f < 0) continue;
		compiled.decodeAt(f, data, dataOffset[i], length[i], out, frames[f].channelStart);
	}
	sink += out[0];
}

/** a2 baseline: hand-written dispatch by a dense 11-bit table, one length check, DataView reads. */
function dispatchDataView(store: FrameStore, slotOf: Int32Array, out: Float64Array): void {
	const { id, flags, length, dataOffset, data } = store;
	const view = new DataView(data.buffer, data.byteOffset, data.byteLength);
	for (let i = 0; i < store.count; i++) {
		const frameId = id[i];
		const slot =
			(flags[i] & FLAG_EXTENDED) === 0 && frameId <= MAX_STANDARD_ID ? slotOf[frameId] : -1;
		if (slot < 0 || length[i] < ALIGNED_BYTES) continue;
		const at = dataOffset[i];
		const o = 3 * slot;
		out[o] = view.getUint16(at, true) * 0.1 - 5;
		out[o + 1] = view.getInt16(at + 2, false) * 0.01;
		out[o + 2] = view.getUint8(at + 4) - 40;
	}
	sink += out[0];
}

/** a3: the bare loop — slot from ID arithmetic, no table, no length check. */
function bareDataView(store: FrameStore, out: Float64Array): void {
	const { id, dataOffset, data } = store;
	const view = new DataView(data.buffer, data.byteOffset, data.byteLength);
	for (let i = 0; i < store.count; i++) {
		const at = dataOffset[i];
		const o = 3 * (id[i] - FIRST_ID);
		out[o] = view.getUint16(at, true) * 0.1 - 5;
		out[o + 1] = view.getInt16(at + 2, false) * 0.01;
		out[o + 2] = view.getUint8(at + 4) - 40;
	}
	sink += out[0];
}

function phaseDecode() {
	const store = makeStore();
	const full = compileMap(mapWith([...aligned, ...unaligned]));
	const alignedOnly = compileMap(mapWith(aligned));
	const out = new Float64Array(full.channels.length);
	const slotOf = new Int32Array(MAX_STANDARD_ID + 1).fill(-1);
	for (let k = 0; k < IDS; k++) slotOf[FIRST_ID + k] = k;

	// Sanity, not timing: the baseline and the compiled map must produce the same values.
	const a = new Float64Array(3 * IDS);
	const b = new Float64Array(3 * IDS);
	dispatchDataView(store, slotOf, a);
	decodeDispatching(store, alignedOnly, b);
	if (a.some((v, k) => v !== b[k]))
		throw new Error('bench: compiled decoder and DataView baseline disagree');

	return {
		extractCompiled: best(() => extractCompiled(store, alignedOnly, out)),
		extractDataView: best(() => extractDataView(store, out)),
		dispatchCompiled: best(() => decodeDispatching(store, alignedOnly, out)),
		dispatchDataView: best(() => dispatchDataView(store, slotOf, out)),
		bareDataView: best(() => bareDataView(store, out)),
		fullCompiled: best(() => decodeDispatching(store, full, out)),
		decodeChannels: best(() => decodeChannels(store, full), 3),
		rssMb: peakRssMb(),
		sink
	};
}

// ---------- (b) and (c): streamed from the CSV file ----------

/** The file as a stream of byte chunks (a Node read stream is an async iterable of Uint8Array). */
const fileChunks = (path: string) => createReadStream(path, { highWaterMark: CHUNK_BYTES });

async function phaseIngest(path: string, canonicalFastPath: boolean) {
	const compiled = compileMap(mapWith([...aligned, ...unaligned]));
	const start = performance.now();
	const imported = await ingestCapture(fileChunks(path), { canonicalFastPath });
	const ingestSeconds = (performance.now() - start) / 1000;
	let channels: ReturnType<typeof decodeChannels> = [];
	const decodeSeconds = seconds(() => (channels = decodeChannels(imported.store, compiled)));
	return {
		ingestSeconds,
		decodeSeconds,
		frames: imported.frameCount,
		badRows: imported.badRowCount,
		samples: channels.reduce((n, c) => n + c.count, 0),
		rssMb: peakRssMb()
	};
}

/** papaparse alone on the same stream: the text work our ingest cannot avoid, rows thrown away. */
async function phasePapaparse(path: string) {
	const start = performance.now();
	const rows = await papaparseRows(fileChunks(path), ',');
	return { seconds: (performance.now() - start) / 1000, rows, rssMb: peakRssMb() };
}

/** For reference: papaparse's one-call API on the whole text, which keeps the text and every row. */
async function phasePapaparseWhole(path: string) {
	const { readFileSync } = await import('node:fs');
	const start = performance.now();
	const rows = Papa.parse<string[]>(readFileSync(path, 'utf8'), { delimiter: ',' }).data.length;
	return { seconds: (performance.now() - start) / 1000, rows, rssMb: peakRssMb() };
}

// ---------- the parent: run each phase in its own process and print ----------

function runPhase<T>(phase: string, ...args: string[]): T {
	const self = fileURLToPath(import.meta.url);
	const child = spawnSync(
		process.execPath,
		[...process.execArgv, self, '--phase', phase, ...args],
		{
			encoding: 'utf8',
			maxBuffer: 1 << 24
		}
	);
	if (child.status !== 0) throw new Error(`bench phase ${phase} failed:\n${child.stderr}`);
	return JSON.parse(child.stdout.trim().split('\n').at(-1)!) as T;
}

/**
 * Best time over a few separate processes (each run is cold: ingest cannot be repeated in one), the
 * phases interleaved so that a busy spell on the machine hits both sides of a ratio alike.
 */
function bestInterleaved<T extends { rssMb: number }>(
	runs: number,
	phases: { phase: string; key: keyof T }[],
	...args: string[]
): T[] {
	const results: T[][] = phases.map(() => []);
	for (let r = 0; r < runs; r++)
		phases.forEach(({ phase }, p) => results[p].push(runPhase<T>(phase, ...args)));
	return phases.map(({ key }, p) => {
		const fastest = results[p].reduce((a, b) => ((b[key] as number) < (a[key] as number) ? b : a));
		// Memory: the largest peak any run reached, not the fastest run's.
		return { ...fastest, rssMb: Math.max(...results[p].map((r) => r.rssMb)) };
	});
}

const f3 = (s: number) => `${s.toFixed(3)} s`;
const rate = (n: number, s: number) => `${(n / s / 1e6).toFixed(1)} M/s`;
const ratio = (a: number, b: number) => `${(a / b).toFixed(2)}×`;
const mb = (n: number) => `${n.toFixed(0)} MB`;

async function main() {
	const phaseAt = process.argv.indexOf('--phase');
	if (phaseAt >= 0) {
		const [phase, path] = process.argv.slice(phaseAt + 1);
		const run = {
			idle: async () => ({ rssMb: peakRssMb() }),
			decode: phaseDecode,
			ingest: () => phaseIngest(path, true),
			'ingest-general': () => phaseIngest(path, false),
			papaparse: () => phasePapaparse(path),
			'papaparse-whole': () => phasePapaparseWhole(path)
		}[phase];
		if (!run) throw new Error(`unknown phase ${phase}`);
		console.log(JSON.stringify(await run()));
		return;
	}

	console.log(
		`Framewright decode benchmark: ${FRAMES.toLocaleString('en')} frames, ${IDS} IDs, ${IDS * 5} signals (each phase in its own process)`
	);
	const a = runPhase<ReturnType<typeof phaseDecode>>('decode');
	console.log('\n(a) decode only, in memory (best of 5)');
	console.log(
		`  a1 extraction, one frame definition, 3 aligned fields: compiled ${f3(a.extractCompiled)}, DataView ${f3(a.extractDataView)} → ${ratio(a.extractCompiled, a.extractDataView)}`
	);
	console.log(
		`  a2 dispatching by ID, 3 aligned fields (the aim, ≤ 2×): compiled ${f3(a.dispatchCompiled)}, DataView + ID table ${f3(a.dispatchDataView)} → ${ratio(a.dispatchCompiled, a.dispatchDataView)}`
	);
	console.log(
		`  a3 bare DataView loop, no lookup (reference): ${f3(a.bareDataView)}; compiled a2 / bare → ${ratio(a.dispatchCompiled, a.bareDataView)}`
	);
	console.log(
		`  all 200 signals (aligned + unaligned): ${f3(a.fullCompiled)} = ${rate(FRAMES, a.fullCompiled)} frames, ${rate(FRAMES * 5, a.fullCompiled)} signals`
	);
	console.log(
		`  decodeChannels (lookup, decode, time + value arrays, statistics; best of 3): ${f3(a.decodeChannels)}`
	);
	console.log(`  peak RSS of this phase (store + channels in memory): ${mb(a.rssMb)}`);

	const dir = mkdtempSync(join(tmpdir(), 'framewright-bench-'));
	try {
		const path = join(dir, 'capture.csv');
		const bytes = writeCsv(path);
		console.log(
			`\n(b) CSV ingest + decode, ${(bytes / 2 ** 20).toFixed(1)} MB file streamed in 1 MiB chunks (best of ${RUNS} processes each, interleaved)`
		);
		type Timed = { seconds: number; rows: number; rssMb: number };
		type Ingested = Awaited<ReturnType<typeof phaseIngest>>;
		const [papa, ingest, general] = bestInterleaved<Timed & Ingested>(
			RUNS,
			[
				{ phase: 'papaparse', key: 'seconds' },
				{ phase: 'ingest', key: 'ingestSeconds' },
				{ phase: 'ingest-general', key: 'ingestSeconds' }
			],
			path
		);
		const whole = runPhase<Timed>('papaparse-whole', path);
		const total = ingest.ingestSeconds + ingest.decodeSeconds;
		console.log(
			`  papaparse alone, streamed: ${f3(papa.seconds)} (${papa.rows.toLocaleString('en')} rows)`
		);
		console.log(
			`  ingest (canonical lines in place, others via papaparse → frame store): ${f3(ingest.ingestSeconds)} (${ingest.frames.toLocaleString('en')} frames, ${ingest.badRows} bad rows)`
		);
		console.log(
			`  decode to channels: ${f3(ingest.decodeSeconds)} (${ingest.samples.toLocaleString('en')} samples)`
		);
		console.log(
			`  ingest + decode / papaparse alone: ${ratio(total, papa.seconds)} (aim ≤ 1.25×); ingest alone / papaparse: ${ratio(ingest.ingestSeconds, papa.seconds)}`
		);
		const generalTotal = general.ingestSeconds + general.decodeSeconds;
		console.log(
			`  general route (every line through papaparse): ingest ${f3(general.ingestSeconds)} + decode ${f3(general.decodeSeconds)} → ${ratio(generalTotal, papa.seconds)} of papaparse alone`
		);
		console.log(`  reference: papaparse one call on the whole text ${f3(whole.seconds)}`);

		console.log('\n(c) peak resident memory (each its own process)');
		console.log(
			`  ingest + decode, streamed (aim < 400 MB): ${mb(ingest.rssMb)}; general route: ${mb(general.rssMb)}`
		);
		console.log(
			`  papaparse alone, streamed: ${mb(papa.rssMb)}; papaparse one call on the whole text: ${mb(whole.rssMb)}`
		);
		console.log(
			`  for scale: a bench process that only starts (Node + tsx + imports): ${mb(runPhase<{ rssMb: number }>('idle').rssMb)}`
		);
	} finally {
		rmSync(dir, { recursive: true, force: true });
	}
}

main().catch((error) => {
	console.error(error);
	process.exitCode = 1;
});
