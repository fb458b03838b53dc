import { describe, expect, it } from 'vitest';
import { FrameStore } from './frame-store';
import { scanJ1939 } from './j1939-scan';

/**
 * A DM1 (PGN 0xFECA, SAE J1939-73) with two trouble codes sent by connection mode from SA 0x00 to
 * SA 0x21, frame by frame from the SAE J1939-21 layouts: TP.CM (PGN 0xEC00, PS = destination)
 * RTS = control 16, size 10 in bytes 1–2, 2 packets, no limit per CTS (0xFF), PGN in bytes 5–7;
 * CTS = 17, 2 packets from number 1; TP.DT (0xEB00) sequence number + 7 bytes; EndOfMsgACK = 19.
 * IDs: priority 7 → 0x1C, PF 0xEC/0xEB, PS = destination, then the source address.
 */
const frames: [number, number, number[]][] = [
	[2.0, 0x1cec2100, [16, 10, 0, 2, 0xff, 0xca, 0xfe, 0x00]], // RTS 0x00 → 0x21
	[2.01, 0x1cec0021, [17, 2, 1, 0xff, 0xff, 0xca, 0xfe, 0x00]], // CTS 0x21 → 0x00
	// lamps 04 FF; DTC SPN 110 FMI 3 OC 1; first byte of DTC 2
	[2.02, 0x1ceb2100, [1, 0x04, 0xff, 0x6e, 0x00, 0x03, 0x01, 0xbe]],
	// rest of DTC 2: SPN 190 FMI 16 OC 2; padding 0xFF
	[2.03, 0x1ceb2100, [2, 0x00, 0x10, 0x02, 0xff, 0xff, 0xff, 0xff]],
	[2.04, 0x1cec0021, [19, 10, 0, 2, 0xff, 0xca, 0xfe, 0x00]], // EndOfMsgACK 0x21 → 0x00
	// A second RTS (0x05 → 0x21, 20 bytes in 3 packets) that the capture cuts off after its CTS.
	[2.5, 0x1cec2105, [16, 20, 0, 3, 0xff, 0x00, 0xef, 0x00]],
	[2.51, 0x1cec0521, [17, 3, 1, 0xff, 0xff, 0x00, 0xef, 0x00]],
	[2.52, 0x1ceb2105, [1, 1, 2, 3, 4, 5, 6, 7]]
];

describe('scanJ1939 with connection-mode (RTS/CTS) transport', () => {
	const store = new FrameStore();
	for (const [time, id, data] of frames) store.add(time, id, true, Uint8Array.from(data), 8);
	const scan = scanJ1939(store);

	it('lists the reassembled message like a BAM one, with its mode and destination', () => {
		expect(scan.transportMessages).toEqual([
			{
				time: 2.04,
				mode: 'rts-cts',
				pgn: 0xfeca,
				sourceAddress: 0x00,
				destinationAddress: 0x21,
				length: 10,
				data: Uint8Array.of(0x04, 0xff, 0x6e, 0x00, 0x03, 0x01, 0xbe, 0x00, 0x10, 0x02)
			}
		]);
	});

	it('reads the DM1 it carries (SAE J1939-73)', () => {
		expect(scan.dm1.map((m) => [m.time, m.viaTransport, m.sourceAddress])).toEqual([
			[2.04, true, 0]
		]);
		expect(scan.troubleCodes.map((c) => [c.spn, c.fmi, c.occurrenceCount])).toEqual([
			[110, 3, 1],
			[190, 16, 2]
		]);
	});

	it('reports the transfer the capture cut off as incomplete', () => {
		expect(scan.transportProblems).toEqual([
			expect.objectContaining({
				kind: 'incomplete',
				mode: 'rts-cts',
				sourceAddress: 0x05,
				destinationAddress: 0x21,
				pgn: 0xef00,
				time: 2.52
			})
		]);
		expect(scan.transportProblems[0].message).toMatch(/waiting for packet 2; 1 of 3 packets/);
	});
});
