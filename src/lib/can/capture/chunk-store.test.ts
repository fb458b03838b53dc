// The chunked store against the whole-capture FrameStore (the reference: its own tests check it field
// by field), on random captures and on the demo fixtures; the chunked decode against decodeCapture.
import { createReadStream } from 'node:fs';
import { readFile } from 'node:fs/promises';
import { Readable } from 'node:stream';
import { describe, expect, it } from 'vitest';
import { compileMap } from '../decoder';
import { parseMap } from '../map-json';
import { seededRandom } from '../testing/seeded-random';
import { ChunkIndex, ChunkStoreWriter, Segment } from './chunk-store';
import {
	channelSamples,
	chunkSource,
	decodeChunked,
	decodeChunkedPart,
	decodedSegments,
	keysOfFrame,
	mergeDecodeParts,
	planDecodeParts
} from './chunked-decode';
import {
	framesCsvChunked,
	longFormCsvChunked,
	wideFormCsvChunked,
	wideRows
} from './chunked-export';
import { decodeCapture } from './decode-capture';
import { canonicalCaptureCsv, longFormCsv, wideFormCsv } from './export';
import { FrameStore } from './frame-store';
import { ingestCapture, ingestCaptureInto } from './ingest';

const fixture = (name: string) => new URL(`../../../../fixtures/${name}`, import.meta.url);

/** Writes into a chunked store kept in memory; returns a ChunkSource over it (index through bytes). */
function memoryStore(segmentFrames: number) {
	const segments: Uint8Array[] = [];
	const writer = new ChunkStoreWriter({
		segmentFrames,
		onSegment: (s, bytes) => (segments[s] = bytes)
	});
	const open = (origin = { timeOrigin: 0, epoch: false }) => {
		const index = ChunkIndex.fromBytes(writer.finish(origin).toBytes());
		let rangeReads = 0;
		const source = chunkSource(index, {
			segment: async (s) => segments[s],
			range: async (s, offset, length) => {
				rangeReads++;
				return segments[s].slice(offset, offset + length);
			}
		});
		return { index, source, segments, rangeReads: () => rangeReads };
	};
	return { writer, open };
}

function randomCapture(seed: number, frames: number) {
	const rand = seededRandom(seed);
	const ids = Array.from({ length: rand.int(1, 40) }, () =>
		rand.next() < 0.3
			? { id: rand.int(0, 0x1fffffff), extended: true }
			: { id: rand.int(0, 0x7ff), extended: false }
	);
	const rows: [number, number, boolean, Uint8Array][] = [];
	let t = 0;
	for (let i = 0; i < frames; i++) {
		const { id, extended } = rand.pick(ids);
		t += rand.next() < 0.05 ? -0.001 : rand.next() * 0.002; // a few rows go back in time
		const length = rand.pick([0, 1, 2, 5, 8, 8, 8, 12, 64]);
		rows.push([t, id, extended, rand.bytes(length)]);
	}
	return rows;
}

/** Every segment rebuilt in capture order, appended: must equal the FrameStore column by column. */
async function expectSameFrames(store: FrameStore, source: ReturnType<typeof chunkSource>) {
	const time: number[] = [];
	const id: number[] = [];
	const flags: number[] = [];
	const payloads: number[][] = [];
	for (let s = 0; s < source.index.segmentCount; s++) {
		const c = (await source.segment(s)).columns();
		for (let i = 0; i < c.count; i++) {
			time.push(c.time[i]);
			id.push(c.id[i]);
			flags.push(c.flags[i]);
			payloads.push(Array.from(c.data.subarray(c.dataOffset[i], c.dataOffset[i] + c.length[i])));
			expect(c.kind[i]).toBe(0);
			expect(c.direction[i]).toBe(0);
			expect(c.bus[i]).toBe(0);
			expect(c.tag[i]).toBe(0);
		}
	}
	expect(time).toEqual(Array.from(store.time));
	expect(id).toEqual(Array.from(store.id));
	expect(flags).toEqual(Array.from(store.flags));
	expect(payloads).toEqual(
		Array.from({ length: store.count }, (_, i) => Array.from(store.payload(i)))
	);
}

describe('chunked frame store', () => {
	it.each([
		[1, 1, 200],
		[2, 7, 1000],
		[3, 100, 5000],
		[4, 4096, 3000],
		[5, 64, 0]
	])(
		'seed %i, %i frames per segment: same frames as FrameStore, per ID and in capture order',
		async (seed, segmentFrames, frames) => {
			const rows = randomCapture(seed, frames);
			const store = new FrameStore();
			const { writer, open } = memoryStore(segmentFrames);
			for (const [t, id, ext, data] of rows) {
				store.add(t, id, ext, data, data.length);
				writer.add(t, id, ext, data, data.length);
			}
			const { index, source } = open({ timeOrigin: 12.5, epoch: true });
			expect(index.header.frameCount).toBe(frames);
			expect(index.header.origin).toEqual({ timeOrigin: 12.5, epoch: true });
			expect(index.segmentCount).toBe(Math.ceil(frames / segmentFrames));
			await expectSameFrames(store, source);
			// Each identifier's chunks hold exactly its frames, in capture order.
			for (let k = 0; k < index.keyCount; k++) {
				const want = [...Array(store.count).keys()].filter(
					(i) =>
						store.id[i] === index.keyId[k] && store.isExtended(i) === (index.keyExtended[k] === 1)
				);
				const got: number[][] = [];
				const times: number[] = [];
				for (let c = index.keyChunkStart[k]; c < index.keyChunkStart[k + 1]; c++) {
					expect(index.chunkRank[c]).toBe(got.length);
					const chunk = await source.chunk(c);
					for (let j = 0; j < chunk.count; j++) {
						got.push(
							Array.from(
								chunk.data.subarray(chunk.dataOffset[j], chunk.dataOffset[j] + chunk.length[j])
							)
						);
						times.push(chunk.time[j]);
					}
					expect(index.chunkMinTime[c]).toBe(Math.min(...chunk.time));
					expect(index.chunkMaxTime[c]).toBe(Math.max(...chunk.time));
				}
				expect(index.frameCountOf(k)).toBe(want.length);
				expect(got).toEqual(want.map((i) => Array.from(store.payload(i))));
				expect(times).toEqual(want.map((i) => store.time[i]));
				expect(index.keyOf(index.keyId[k], index.keyExtended[k] === 1)).toBe(k);
			}
		}
	);

	it('refuses damaged bytes with a message', () => {
		const { writer, open } = memoryStore(10);
		writer.add(0, 1, false, Uint8Array.of(1), 1);
		const { segments, index } = open();
		expect(() => ChunkIndex.fromBytes(new Uint8Array(8))).toThrow(/magic/);
		expect(() => ChunkIndex.fromBytes(index.toBytes().subarray(0, 60))).toThrow(/damaged|JSON/);
		expect(() => new Segment(new Uint8Array(40), index.keyId)).toThrow(/magic/);
		expect(new Segment(segments[0], index.keyId).count).toBe(1);
	});
});

async function fixtureDecode(
	mapName: string,
	captureName: string,
	segmentFrames: number,
	edit?: (csv: string) => string
) {
	const parsed = parseMap(await readFile(fixture(mapName), 'utf8'));
	if (!parsed.ok) throw new Error('fixture map does not parse');
	const compiled = compileMap(parsed.map);
	const text = edit ? edit(await readFile(fixture(captureName), 'utf8')) : null;
	const read = () =>
		text === null ? createReadStream(fixture(captureName)) : Readable.from([Buffer.from(text)]);
	const whole = await ingestCapture(read());
	const { writer, open } = memoryStore(segmentFrames);
	const report = await ingestCaptureInto(read(), writer);
	const chunked = open({ timeOrigin: report.timeOrigin ?? 0, epoch: report.layout.epochTime });
	return { compiled, whole, report, ...chunked };
}

describe('chunked decode of the demo fixtures (decodeCapture on the whole FrameStore is the reference)', () => {
	it.each([
		['club-racer-ecu.map.json', 'club-racer-session.csv', 1000],
		['genset-j1939.map.json', 'genset-idle.csv', 333]
	])('%s over %s', async (mapName, captureName, segmentFrames) => {
		const { compiled, whole, report, source, index, rangeReads } = await fixtureDecode(
			mapName,
			captureName,
			segmentFrames
		);
		expect(report.frameCount).toBe(whole.frameCount);
		expect(index.segmentCount).toBeGreaterThan(2);
		await expectSameFrames(whole.store, source);

		const reference = decodeCapture(whole.store, compiled);
		const chunked = await decodeChunked(source, compiled);
		expect(chunked.frameCount).toBe(reference.frameCount);
		expect(chunked.duration).toBe(reference.duration);
		expect(chunked.ids).toEqual(reference.ids);
		expect(chunked.unknownIds).toEqual(reference.unknownIds);
		expect(chunked.busLoad).toEqual(reference.busLoad);
		expect(chunked.j1939).toEqual(reference.j1939);
		reference.channels.forEach((c, k) => {
			const s = chunked.channels[k];
			expect(s.info).toEqual(c.info);
			expect([s.count, s.min, s.max, s.last]).toEqual([c.count, c.min, c.max, c.last]);
			expect([s.outOfRangeCount, s.notAvailableCount, s.errorCount]).toEqual([
				c.outOfRangeCount,
				c.notAvailableCount,
				c.errorCount
			]);
			expect(s.mean).toBe(c.mean);
			// And straight from the samples (a direct computation, not decodeChannels' summary).
			const values = Array.from(c.value);
			if (values.length) {
				expect(s.min).toBe(values.reduce((a, b) => Math.min(a, b)));
				expect(s.max).toBe(values.reduce((a, b) => Math.max(a, b)));
				expect(s.mean!).toBeCloseTo(values.reduce((a, b) => a + b, 0) / values.length, 9);
				expect(s.firstTime).toBe(c.time[0]);
				expect(s.lastTime).toBe(c.time[c.count - 1]);
				const lo = c.info.min ?? -Infinity;
				const hi = c.info.max ?? Infinity;
				expect(s.outOfRangeCount).toBe(values.filter((v) => v < lo || v > hi).length);
			}
			expect(chunked.pyramids[k].count).toBe(c.count);
		});

		// A channel's samples from its identifier's chunks only: the whole channel, then a window.
		const busiest = reference.channels.reduce((a, b) => (b.count > a.count ? b : a));
		const before = rangeReads();
		const all = await channelSamples(source, compiled, busiest.info.index);
		expect(Array.from(all.time)).toEqual(Array.from(busiest.time));
		expect(Array.from(all.value)).toEqual(Array.from(busiest.value));
		expect(rangeReads()).toBeGreaterThan(before); // ranged reads of chunks, not whole segments
		const mid = busiest.time[Math.floor(busiest.count / 2)];
		const part = await channelSamples(source, compiled, busiest.info.index, mid, mid + 0.5);
		expect(part.time.length).toBeLessThan(busiest.count);
		const inside = Array.from(busiest.time).filter((t) => t >= mid && t <= mid + 0.5);
		expect(Array.from(part.time).filter((t) => t >= mid && t <= mid + 0.5)).toEqual(inside);

		// Segment by segment, the channels concatenate to decodeCapture's.
		const joined = reference.channels.map(() => [] as number[]);
		for await (const { channels } of decodedSegments(source, compiled))
			channels.forEach((c, k) => joined[k].push(...c.value.subarray(0, c.count)));
		reference.channels.forEach((c, k) => expect(joined[k]).toEqual(Array.from(c.value)));
	});
});

/** Every other EEC1 frame (PGN 61444) sent from source address 0x01 instead of 0x00: the J1939 map decodes both. */
const secondEngine = (csv: string) => {
	let n = 0;
	return csv.replace(/,0CF00400,/g, (m) => (n++ % 2 ? ',0CF00401,' : m));
};

describe('a first decode split into parts (one per worker) equals the single pass', () => {
	it.each([
		['club-racer-ecu.map.json', 'club-racer-session.csv', 1000, undefined],
		['genset-j1939.map.json', 'genset-idle.csv', 333, undefined],
		['genset-j1939.map.json', 'genset-idle.csv', 250, secondEngine]
	])('%s over %s', async (mapName, captureName, segmentFrames, edit) => {
		const { compiled, source, index } = await fixtureDecode(
			mapName,
			captureName,
			segmentFrames,
			edit
		);
		const single = await decodeChunked(source, compiled);
		// With two engines, a frame is fed by two identifiers (J1939 by PGN): the capture-order path.
		const multiKey = compiled.frames.some((_, f) => keysOfFrame(index, compiled, f).length > 1);
		expect(multiKey).toBe(edit !== undefined);
		for (const [count, busWeight] of [
			[2, 5],
			[2, 0],
			[3, 1],
			[4, 100]
		]) {
			const plan = planDecodeParts(index, compiled, count, busWeight);
			// Every frame owned by exactly one part, the bus figures by part 0 only.
			expect(plan.flatMap((p) => p.frames!).sort((a, b) => a - b)).toEqual(
				compiled.frames.map((_, f) => f)
			);
			expect(plan.map((p) => p.bus)).toEqual(plan.map((_, at) => at === 0));
			expect(plan.length).toBeGreaterThan(1);
			const parts = [];
			for (const part of plan) parts.push(await decodeChunkedPart(source, compiled, part));
			expect(parts.slice(1).every((p) => p.bus === null)).toBe(true);
			expect(mergeDecodeParts(compiled, parts)).toEqual(single);
		}
	});
});

describe('the bus part of a split decode', () => {
	it.each([
		[6, 'with', [0, 1, 5, 8, 8, 12, 64]],
		[7, 'without', [0, 1, 5, 8, 8]]
	])(
		'seed %i, random IDs %s CAN FD frames: survey and bus load equal the single pass',
		async (seed, _fd, lengths) => {
			const parsed = parseMap(await readFile(fixture('club-racer-ecu.map.json'), 'utf8'));
			if (!parsed.ok) throw new Error('fixture map does not parse');
			const compiled = compileMap(parsed.map);
			const rand = seededRandom(seed);
			const ids = [0x100, 0x101, 0x7ff, 0x123, 0x5a5];
			const { writer, open } = memoryStore(700);
			let t = 0;
			for (let i = 0; i < 5000; i++) {
				t += rand.next() * 0.001;
				const data = rand.bytes(rand.pick(lengths));
				writer.add(t, rand.pick(ids), false, data, data.length);
			}
			const { source, index } = open();
			// A data bit rate that is not a power-of-two multiple of the nominal one: FD frames'
			// bit times are then fractions whose sums depend on their order.
			const options = { dataBitrate: 3_000_000 };
			const single = await decodeChunked(source, compiled, options);
			expect(single.busLoad.fdFrames > 0).toBe(lengths.includes(64));
			const plan = planDecodeParts(index, compiled, 2);
			const parts = [];
			for (const part of plan) parts.push(await decodeChunkedPart(source, compiled, part, options));
			const merged = mergeDecodeParts(compiled, parts);
			expect(merged.ids).toEqual(single.ids);
			expect(merged.unknownIds).toEqual(single.unknownIds);
			expect(merged.busLoad).toEqual(single.busLoad);
		}
	);
});

describe('chunked exports (export.ts over the whole capture is the reference)', () => {
	const text = async (chunks: AsyncIterable<string>) => {
		let out = '';
		for await (const c of chunks) out += c;
		return out;
	};
	it.each([
		['club-racer-ecu.map.json', 'club-racer-session.csv', 777],
		['genset-j1939.map.json', 'genset-idle.csv', 250]
	])(
		'%s over %s: frames, long and wide (last and mean) byte for byte',
		async (mapName, captureName, segmentFrames) => {
			const { compiled, whole, source } = await fixtureDecode(mapName, captureName, segmentFrames);
			const reference = decodeCapture(whole.store, compiled);
			const join = (g: Iterable<string>) => [...g].join('');
			expect(await text(framesCsvChunked(source))).toBe(join(canonicalCaptureCsv(whole.store)));
			expect(await text(longFormCsvChunked(source, compiled))).toBe(
				join(longFormCsv(reference.channels))
			);
			const { channels } = await decodeChunked(source, compiled);
			for (const mode of ['last', 'mean'] as const)
				for (const interval of [0.05, 0.0137, 1]) {
					expect(
						await text(
							wideFormCsvChunked(source, compiled, { interval, mode, channelTimes: channels })
						)
					).toBe(join(wideFormCsv(reference.channels, { interval, mode })));
				}
			expect(() => wideRows({ interval: 1e-9, mode: 'last', channelTimes: channels })).toThrow(
				/more than 10000000/
			);
		}
	);
});
