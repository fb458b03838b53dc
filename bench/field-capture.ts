/**
 * The field-proposal benchmarks' capture (bench/fields.ts, bench/fields-worker.ts), documented in
 * bench/fields.ts: 40 IDs × 25,000 frames with planted fields of five kinds (invented data).
 */
import { FrameStore } from '../src/lib/can/capture/frame-store';
import { plantedFrames, type PlantedField } from '../src/lib/can/testing/planted-capture';

export const IDS = 40;
export const FRAMES_PER_ID = 25_000;
export const PERIOD = 0.01;

const noise = (startBit: number, length: number): PlantedField => ({
	kind: 'noise',
	startBit,
	length
});
const value = (
	startBit: number,
	length: number,
	byteOrder: 'little' | 'big',
	speed: number
): PlantedField => ({
	kind: 'value',
	startBit,
	length,
	byteOrder,
	signed: false,
	speed,
	accel: speed / 10
});

export const TEMPLATES: PlantedField[][] = [
	[
		{ kind: 'checksum', byte: 0, algorithm: 'crc8-autosar', dataId: 0x4d, clearedBits: [] },
		value(8, 16, 'little', 150),
		value(40, 16, 'big', 40),
		{ kind: 'counter', startBit: 48, length: 4, byteOrder: 'little', step: 1 },
		noise(52, 12)
	],
	[
		{
			kind: 'mux',
			startBit: 0,
			length: 2,
			pages: [
				{ value: 0, fields: [value(8, 16, 'little', 200)] },
				{
					value: 1,
					fields: [
						value(8, 8, 'little', 3),
						{ kind: 'constant', startBit: 16, length: 8, value: 0x11 }
					]
				},
				{ value: 2, fields: [value(16, 16, 'big', 40)] }
			]
		},
		noise(2, 6),
		value(32, 16, 'big', 150),
		{ kind: 'counter', startBit: 40, length: 8, byteOrder: 'little', step: 3 },
		{ kind: 'checksum', byte: 6, algorithm: 'sum', dataId: null, clearedBits: [] },
		noise(56, 8)
	],
	[noise(0, 32), noise(32, 32)],
	[
		{ kind: 'constant', startBit: 0, length: 8, value: 0xa5 },
		{ kind: 'constant', startBit: 8, length: 8, value: 0 },
		value(16, 8, 'little', 2),
		{ kind: 'constant', startBit: 24, length: 8, value: 0xff },
		{ kind: 'counter', startBit: 32, length: 8, byteOrder: 'little', step: 1 }
	],
	[
		value(0, 16, 'little', 100),
		value(16, 16, 'big', 300),
		value(32, 8, 'little', 5),
		value(40, 16, 'little', 20),
		{ kind: 'checksum', byte: 7, algorithm: 'xor', dataId: null, clearedBits: [] }
	]
];

/** Every frame through `add` (a FrameStore, or a chunked store writer), IDs interleaved in time. */
export function buildCapture<S extends { add: FrameStore['add'] }>(store: S): S {
	const perId = Array.from({ length: IDS }, (_, k) =>
		plantedFrames({
			seed: 0xf1e1d + k,
			frames: FRAMES_PER_ID,
			payloadLength: 8,
			period: PERIOD,
			fields: TEMPLATES[k % TEMPLATES.length]
		})
	);
	// Interleave in time order: ID k's frame i at i·PERIOD + k·PERIOD/IDS.
	for (let i = 0; i < FRAMES_PER_ID; i++) {
		for (let k = 0; k < IDS; k++) {
			const p = perId[k].payloads[i];
			store.add(i * PERIOD + (k * PERIOD) / IDS, 0x100 + k, false, p, p.length);
		}
	}
	return store;
}
