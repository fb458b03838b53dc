/**
 * A capture CSV (docs/capture-csv.md, canonical layout) with one unknown ID of planted fields and a
 * known frame whose signal follows one of them, for the field-proposal route tests, the capture
 * page journey and the benchmark. Invented data (demo only); the expected answers are the planted
 * fields themselves and the linear relation written here, never output of the code under test.
 */
import type { CanMapInput } from '../map';
import { plantedFrames, type PlantedField } from './planted-capture';

export const UNKNOWN_ID = 0x3a1;
export const KNOWN_ID = 0x120;

/** The unknown ID's planted fields (8-byte payload). */
export const PLANTED: PlantedField[] = [
	{
		kind: 'value',
		startBit: 8,
		length: 16,
		byteOrder: 'little',
		signed: false,
		speed: 300,
		accel: 30
	},
	{ kind: 'constant', startBit: 32, length: 8, value: 0x5a },
	{ kind: 'counter', startBit: 48, length: 4, byteOrder: 'little', step: 1 },
	{ kind: 'checksum', byte: 7, algorithm: 'crc8-sae-j1850', dataId: null, clearedBits: [] }
];

/**
 * The known frame's signal carries the unknown value's raw bits with scale 0.5 and offset 25, so
 * the unknown field follows it as physical = 0.5 × raw + 25.
 */
export const FOLLOW = { scale: 0.5, offset: 25 };

/** A map defining only the known frame (big-endian 16 bits in bytes 0–1: start bit 8). */
export const followerMap: CanMapInput = {
	format: 'framewright-map@1',
	name: 'Planted follower demo',
	frames: [
		{
			name: 'DriveStatus',
			id: KNOWN_ID,
			length: 8,
			cycleMs: 10,
			signals: [
				{
					name: 'ShaftSpeed',
					startBit: 8,
					length: 16,
					byteOrder: 'big',
					scale: FOLLOW.scale,
					offset: FOLLOW.offset,
					unit: 'rpm'
				}
			]
		}
	]
};

const hex = (b: number) => b.toString(16).toUpperCase().padStart(2, '0');

/** `frames` frames of each ID, 10 ms apart; the known frame carries the same time as its unknown twin. */
export function followerCaptureCsv(frames = 2000, seed = 14): string {
	const planted = plantedFrames({
		seed,
		frames,
		payloadLength: 8,
		period: 0.01,
		fields: PLANTED
	});
	const lines = ['time,id,extended,dlc,data'];
	for (let i = 0; i < frames; i++) {
		const p = planted.payloads[i];
		const u = p[1] + 256 * p[2]; // little-endian 16 bits from bit 8 = bytes 1 and 2
		const known = [u >> 8, u & 0xff, 0, 0, 0, 0, 0, 0];
		const t = (0.5 + planted.time[i]).toFixed(6);
		lines.push(`${t},${UNKNOWN_ID.toString(16).toUpperCase()},0,8,${Array.from(p, hex).join(' ')}`);
		lines.push(`${t},${KNOWN_ID.toString(16).toUpperCase()},0,8,${known.map(hex).join(' ')}`);
	}
	return `${lines.join('\n')}\n`;
}
