/**
 * Compiled decoder vs a hand-written DataView loop reading the same byte-aligned fields over 1M frames
 * (`npx tsx scripts/bench-decoder.ts`). Target: within 2× (exit code 1 otherwise). Best of 25 runs each,
 * so a busy machine skews both sides alike.
 */
import { compileMap } from '../src/lib/can/decoder';
import { canMapSchema } from '../src/lib/can/map';

const FRAMES = 1_000_000;
const data = new Uint8Array(FRAMES * 8);
for (let i = 0; i < data.length; i++) data[i] = (i * 2654435761) >>> 24;
const out = new Float64Array(FRAMES * 5);

// Demo layout: five byte-aligned fields of both orders and signedness.
const map = canMapSchema.parse({
	format: 'framewright-map@1',
	name: 'bench',
	frames: [
		{
			name: 'F',
			id: 1,
			signals: [
				{ name: 'a', startBit: 0, length: 16, scale: 0.1 },
				{ name: 'b', startBit: 16, length: 16, valueType: 'signed', scale: 0.5, offset: -10 },
				{ name: 'c', startBit: 40, length: 16, byteOrder: 'big', scale: 0.25 },
				{ name: 'd', startBit: 48, length: 8 },
				{ name: 'e', startBit: 56, length: 8, valueType: 'signed' }
			]
		}
	]
});
const frame = compileMap(map).frames[0];

function compiled() {
	for (let i = 0; i < FRAMES; i++) frame.decode(data, i * 8, 8, out, i * 5);
}

function plainDataView() {
	const v = new DataView(data.buffer);
	for (let i = 0; i < FRAMES; i++) {
		const b = i * 8;
		const o = i * 5;
		out[o] = v.getUint16(b, true) * 0.1;
		out[o + 1] = v.getInt16(b + 2, true) * 0.5 - 10;
		out[o + 2] = v.getUint16(b + 4, false) * 0.25;
		out[o + 3] = v.getUint8(b + 6);
		out[o + 4] = v.getInt8(b + 7);
	}
}

function best(run: () => void): number {
	let fastest = Infinity;
	for (let r = 0; r < 25; r++) {
		const t = performance.now();
		run();
		fastest = Math.min(fastest, performance.now() - t);
	}
	return fastest;
}

const plainMs = best(plainDataView);
const compiledMs = best(compiled);
const ratio = compiledMs / plainMs;
console.log(JSON.stringify({ frames: FRAMES, plainDataViewMs: +plainMs.toFixed(2), compiledMs: +compiledMs.toFixed(2), ratio: +ratio.toFixed(2) }));
process.exitCode = ratio <= 2 ? 0 : 1;
