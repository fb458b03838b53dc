/**
 * Decoding benchmark (`npm run bench`). Prints figures only; nothing here asserts a timing.
 * 1,000,000 frames over 40 IDs, 5 signals each (200 signals): three byte-aligned fields
 * (16-bit little-endian, 16-bit big-endian, 8-bit) and two unaligned ones (12 and 11 bits).
 *   (a) decode-only throughput, and the compiled decoder against a plain DataView loop reading
 *       the same byte-aligned fields;
 *   (b) CSV import + decode against papaparse parsing the same text alone;
 *   (c) peak resident memory.
 */
import Papa from 'papaparse';
import { decodeChannels } from '../src/lib/can/capture/channels';
import { FrameStore } from '../src/lib/can/capture/frame-store';
import { ingestCapture } from '../src/lib/can/capture/ingest';
import { compileMap, type CompiledMap } from '../src/lib/can/decoder';
import { canMapSchema, type SignalInput } from '../src/lib/can/map';
import { seededRandom } from '../src/lib/can/testing/seeded-random';

const FRAMES = 1_000_000;
const IDS = 40;
const FIRST_ID = 0x100;

const aligned: SignalInput[] = [
	{ name: 'le16', startBit: 0, length: 16, byteOrder: 'little', scale: 0.1, offset: -5 },
	{ name: 'be16', startBit: 24, length: 16, byteOrder: 'big', valueType: 'signed', scale: 0.01 },
	{ name: 'u8', startBit: 32, length: 8, offset: -40 }
];
const unaligned: SignalInput[] = [
	{ name: 'u12', startBit: 40, length: 12, scale: 0.25 },
	{ name: 'u11', startBit: 52, length: 11, byteOrder: 'little', scale: 0.5, offset: 10 }
];

const mapWith = (signals: SignalInput[]) =>
	canMapSchema.parse({
		format: 'framewright-map@1',
		name: 'bench',
		frames: Array.from({ length: IDS }, (_, k) => ({ name: `F${k}`, id: FIRST_ID + k, cycleMs: 10, signals }))
	});

function makeStore(): FrameStore {
	const rand = seededRandom(0xbe7c4);
	const store = new FrameStore();
	for (let i = 0; i < FRAMES; i++) {
		store.add(i * 1e-4, FIRST_ID + rand.int(0, IDS - 1), false, rand.bytes(8), 8);
	}
	return store;
}

function time<T>(run: () => T): { seconds: number; result: T } {
	const start = performance.now();
	const result = run();
	return { seconds: (performance.now() - start) / 1000, result };
}

/** The compiled decoder over every frame; returns a checksum so the work cannot be skipped. */
function decodeAll(store: FrameStore, compiled: CompiledMap): number {
	const out = new Float64Array(compiled.channels.length);
	const { id, length, dataOffset, data } = store;
	let sum = 0;
	for (let i = 0; i < store.count; i++) {
		const frame = compiled.lookup(id[i], false)!;
		frame.decode(data, dataOffset[i], length[i], out, frame.channelStart);
		sum += out[frame.channelStart];
	}
	return sum;
}

/** The hand-written baseline: DataView reads of the three byte-aligned fields, same scaling. */
function dataViewAll(store: FrameStore): number {
	const { id, dataOffset, data } = store;
	const view = new DataView(data.buffer, data.byteOffset, data.byteLength);
	const out = new Float64Array(3 * IDS);
	let sum = 0;
	for (let i = 0; i < store.count; i++) {
		const at = dataOffset[i];
		const base = 3 * (id[i] - FIRST_ID);
		out[base] = view.getUint16(at, true) * 0.1 - 5;
		out[base + 1] = view.getInt16(at + 2, false) * 0.01;
		out[base + 2] = view.getUint8(at + 4) - 40;
		sum += out[base];
	}
	return sum;
}

function toCsv(store: FrameStore): string {
	const lines = ['time,id,extended,dlc,data'];
	for (let i = 0; i < store.count; i++) {
		const hex = Array.from(store.payload(i), (b) => b.toString(16).padStart(2, '0')).join(' ');
		lines.push(`${store.time[i].toFixed(6)},${store.id[i].toString(16)},0,8,${hex}`);
	}
	return lines.join('\n') + '\n';
}

const rate = (n: number, s: number) => `${(n / s / 1e6).toFixed(2)} M/s`;

async function main() {
	console.log(`Generating ${FRAMES.toLocaleString('en')} frames over ${IDS} IDs…`);
	const store = makeStore();
	const full = compileMap(mapWith([...aligned, ...unaligned]));
	const alignedOnly = compileMap(mapWith(aligned));

	// Warm up every path once so the JIT has compiled them before timing.
	decodeAll(store, full);
	decodeAll(store, alignedOnly);
	dataViewAll(store);

	const best = (run: () => number) => Math.min(...[0, 1, 2].map(() => time(run).seconds));
	const fullSeconds = best(() => decodeAll(store, full));
	const alignedSeconds = best(() => decodeAll(store, alignedOnly));
	const viewSeconds = best(() => dataViewAll(store));
	console.log('\n(a) decode only (best of 3)');
	console.log(`  200 signals (aligned + unaligned): ${fullSeconds.toFixed(3)} s  ${rate(FRAMES, fullSeconds)} frames, ${rate(FRAMES * 5, fullSeconds)} signals`);
	console.log(`  byte-aligned fields, compiled decoder: ${alignedSeconds.toFixed(3)} s  ${rate(FRAMES * 3, alignedSeconds)} signals`);
	console.log(`  byte-aligned fields, plain DataView loop: ${viewSeconds.toFixed(3)} s  ${rate(FRAMES * 3, viewSeconds)} signals`);
	console.log(`  compiled decoder / DataView time: ${(alignedSeconds / viewSeconds).toFixed(2)}×`);

	const csv = toCsv(store);
	console.log(`\n(b) CSV import + decode of ${(csv.length / 2 ** 20).toFixed(1)} MB text`);
	const papa = time(() => Papa.parse<string[]>(csv, { delimiter: ',' }).data.length);
	const start = performance.now();
	const imported = await ingestCapture(csv);
	const importSeconds = (performance.now() - start) / 1000;
	const decoded = time(() => decodeChannels(imported.store, full));
	const total = importSeconds + decoded.seconds;
	console.log(`  papaparse alone: ${papa.seconds.toFixed(3)} s (${papa.result.toLocaleString('en')} rows)`);
	console.log(`  import: ${importSeconds.toFixed(3)} s (${imported.frameCount.toLocaleString('en')} frames, ${imported.badRowCount} bad rows)`);
	console.log(`  decode to channels: ${decoded.seconds.toFixed(3)} s (${decoded.result.reduce((n, c) => n + c.count, 0).toLocaleString('en')} samples)`);
	console.log(`  import + decode / papaparse alone: ${(total / papa.seconds).toFixed(2)}×`);

	console.log(`\n(c) peak resident memory: ${(process.resourceUsage().maxRSS / 1024).toFixed(0)} MB`);
}

main().catch((error) => {
	console.error(error);
	process.exitCode = 1;
});
