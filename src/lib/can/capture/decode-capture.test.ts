import { describe, expect, it } from 'vitest';
import { compileMap } from '../decoder';
import { canMapSchema } from '../map';
import { referenceFrameBits } from '../testing/reference-frame-bits';
import { decodeCapture } from './decode-capture';
import { FrameStore } from './frame-store';

// A tiny invented capture whose expected figures are worked out by hand in the comments.
const map = canMapSchema.parse({
	format: 'framewright-map@1',
	name: 'hand-check',
	bitrate: 500_000,
	frames: [
		{
			name: 'Body',
			id: '0x100',
			cycleMs: 10,
			signals: [
				{ name: 'speed', startBit: 0, length: 16, scale: 0.5, unit: 'km/h', min: 0, max: 100 },
				{ name: 'temp', startBit: 16, length: 8, offset: -40, unit: '°C', min: -40, max: 50 }
			]
		},
		{
			name: 'Paged',
			id: '0x200',
			length: 2,
			signals: [
				{ name: 'page', startBit: 0, length: 8, multiplexer: true },
				{ name: 'a', startBit: 8, length: 8, muxValue: 1 },
				{ name: 'b', startBit: 8, length: 8, muxValue: 2 }
			]
		}
	]
});

function store(rows: [number, number, boolean, number[]][]): FrameStore {
	const s = new FrameStore();
	for (const [t, id, ext, bytes] of rows) s.add(t, id, ext, Uint8Array.from(bytes), bytes.length);
	return s;
}

const capture = store([
	[0.0, 0x100, false, [0x10, 0x00, 0x32, 0, 0, 0, 0, 0]], // speed 16×0.5 = 8, temp 50−40 = 10
	[0.005, 0x200, false, [0x01, 0x05]], // page 1: a = 5
	[0.01, 0x100, false, [0xc8, 0x00, 0x64, 0, 0, 0, 0, 0]], // speed 200×0.5 = 100, temp 100−40 = 60 (> max 50)
	[0.012, 0x300, false, [0x00, 0x00]],
	[0.015, 0x200, false, [0x02, 0x07]], // page 2: b = 7
	[0.018, 0x300, false, [0x01, 0x00]], // bit 0 changed
	[0.021, 0x100, false, [0x90, 0x01, 0x28, 0, 0, 0, 0, 0]], // speed 400×0.5 = 200 (> max 100), temp 0
	[0.024, 0x300, false, [0x03, 0x80]], // bits 1 and 15 changed
	[0.025, 0x200, false, [0x01, 0x06]], // page 1: a = 6
	[0.027, 0x300, false, [0x02, 0x80]], // bit 0 changed
	[0.03, 0x100, false, [0x00, 0x00, 0x00, 0, 0, 0, 0, 0]] // speed 0, temp −40
]);

describe('decodeCapture', () => {
	const result = decodeCapture(store([]), compileMap(map));
	it('handles an empty capture', () => {
		expect(result.frameCount).toBe(0);
		expect(result.channels.every((c) => c.count === 0 && c.min === null)).toBe(true);
		expect(result.busLoad.windows).toEqual([]);
	});

	const decoded = decodeCapture(capture, compileMap(map));
	const channel = (name: string) => decoded.channels.find((c) => c.info.signalName === name)!;

	it('builds channels with hand-computed statistics', () => {
		const speed = channel('speed');
		expect(Array.from(speed.time)).toEqual([0, 0.01, 0.021, 0.03]);
		expect(Array.from(speed.value)).toEqual([8, 100, 200, 0]);
		// mean (8 + 100 + 200 + 0) / 4 = 77; one sample above max 100
		expect(speed).toMatchObject({
			count: 4,
			min: 0,
			max: 200,
			mean: 77,
			last: 0,
			outOfRangeCount: 1
		});
		const temp = channel('temp');
		// (10 + 60 + 0 − 40) / 4 = 7.5; 60 is above max 50; −40 equals min, so in range
		expect(temp).toMatchObject({
			count: 4,
			min: -40,
			max: 60,
			mean: 7.5,
			last: -40,
			outOfRangeCount: 1
		});
	});

	it('keeps only present samples of multiplexed signals', () => {
		expect(Array.from(channel('a').time)).toEqual([0.005, 0.025]);
		expect(Array.from(channel('a').value)).toEqual([5, 6]);
		expect(Array.from(channel('b').value)).toEqual([7]);
		expect(channel('page').count).toBe(3);
	});

	it('reports per-ID rate, period and jitter against the map cycle time', () => {
		const body = decoded.ids.find((s) => s.id === 0x100)!;
		// gaps 10, 11, 9 ms: mean 10 ms; population std dev √((0² + 1² + 1²) / 3) = 0.8165 ms; 3 gaps / 0.03 s = 100 Hz
		expect(body.count).toBe(4);
		expect(body.rateHz).toBeCloseTo(100, 9);
		expect(body.meanPeriodMs).toBeCloseTo(10, 9);
		expect(body.jitterMs).toBeCloseTo(Math.sqrt(2 / 3), 9);
		expect(body).toMatchObject({ frameIndex: 0, frameName: 'Body', cycleMs: 10 });
		expect(decoded.ids.map((s) => s.id)).toEqual([0x100, 0x200, 0x300]);
	});

	it('lists IDs the map does not define with per-bit change counts', () => {
		expect(decoded.unknownIds).toHaveLength(1);
		const unknown = decoded.unknownIds[0];
		expect(unknown).toMatchObject({ id: 0x300, extended: false, count: 4, maxLength: 2 });
		const expected = new Array(16).fill(0);
		expected[0] = 2;
		expected[1] = 1;
		expected[15] = 1;
		expect(Array.from(unknown.bitChanges)).toEqual(expected);
		expect(decoded.ids.find((s) => s.id === 0x300)!.frameIndex).toBeNull();
	});

	it('measures a classical frame’s exact bus bits, within the published bounds', () => {
		const one = decodeCapture(
			store([[0, 0x100, false, [1, 2, 3, 4, 5, 6, 7, 8]]]),
			compileMap(map),
			{ loadWindowSeconds: 0.001 }
		);
		// A 1 ms window at 500 kbit/s holds 500 bits, so the frame's bus bits are 5 × its percentage.
		const bits = one.busLoad.windows[0].percent * 5;
		// Exactly this frame: spelled out bit by bit from ISO 11898-1 (CRC by long division, stuff bits
		// counted one at a time, testing/reference-frame-bits.ts), plus the 3-bit intermission.
		const ref = referenceFrameBits(0x100, false, Uint8Array.of(1, 2, 3, 4, 5, 6, 7, 8));
		expect(bits).toBeCloseTo(ref.bits + ref.stuffBits + 3, 9);
		// And within the published bounds for an 8-byte base-format frame: 108 unstuffed bits + 3
		// intermission (ISO 11898-1) at least, at most 135 bits including intermission (Davis et al. 2007).
		expect(bits).toBeGreaterThanOrEqual(111);
		expect(bits).toBeLessThanOrEqual(135);
	});
});

describe('decodeCapture J1939 pass', () => {
	// SAE J1939-73 DM1 (PGN 65226 = 0xFECA) and J1939-21 BAM (TP.CM 0xEC00 control byte 32, TP.DT 0xEB00).
	// Byte layouts from the standards (from memory); SPN 100/110/190 are oil pressure, coolant
	// temperature and engine speed in J1939-71 (from memory).
	const j1939 = store([
		// single-frame DM1 from SA 0x00, priority 6: amber lamp on (bits 4–3 = 01), SPN 100 FMI 1, OC 3
		[0.0, 0x18feca00, true, [0x04, 0xff, 0x64, 0x00, 0x01, 0x03, 0xff, 0xff]],
		// BAM announce: 10 bytes in 2 packets of PGN 0x00FECA
		[1.0, 0x1cecff00, true, [0x20, 0x0a, 0x00, 0x02, 0xff, 0xca, 0xfe, 0x00]],
		// packet 1: lamps 04 FF, DTC SPN 110 FMI 3 OC 1, first byte of DTC 2
		[1.05, 0x1cebff00, true, [0x01, 0x04, 0xff, 0x6e, 0x00, 0x03, 0x01, 0xbe]],
		// packet 2: rest of DTC 2 = SPN 190 FMI 16 OC 2, padding 0xFF
		[1.1, 0x1cebff00, true, [0x02, 0x00, 0x10, 0x02, 0xff, 0xff, 0xff, 0xff]]
	]);
	const decoded = decodeCapture(j1939, compileMap(map));

	it('finds single-frame and transported DM1 trouble codes', () => {
		const scan = decoded.j1939!;
		expect(scan.dm1.map((m) => [m.time, m.viaTransport, m.troubleCodes.length])).toEqual([
			[0, false, 1],
			[1.1, true, 2]
		]);
		expect(scan.dm1[0].lamps.amberWarning.state).toBe('on');
		expect(
			scan.troubleCodes.map((c) => [c.sourceAddress, c.spn, c.fmi, c.occurrenceCount])
		).toEqual([
			[0, 100, 1, 3],
			[0, 110, 3, 1],
			[0, 190, 16, 2]
		]);
		// The reassembled bytes are the two packets' payloads after their sequence numbers, cut at the announced 10 bytes (J1939-21).
		expect(scan.transportMessages).toEqual([
			{
				time: 1.1,
				mode: 'bam',
				pgn: 0xfeca,
				sourceAddress: 0,
				destinationAddress: 0xff,
				length: 10,
				data: new Uint8Array([0x04, 0xff, 0x6e, 0x00, 0x03, 0x01, 0xbe, 0x00, 0x10, 0x02])
			}
		]);
		expect(scan.transportProblems).toEqual([]);
	});

	it('is skipped for captures without extended frames', () => {
		expect(decodeCapture(capture, compileMap(map)).j1939).toBeNull();
	});
});
