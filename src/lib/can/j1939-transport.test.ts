import { describe, expect, it } from 'vitest';
import { buildJ1939Id, encodeDm1, parseDm1, PGN_DM1 } from './j1939';
import {
	ABORT_REASONS,
	createTransportReassembler,
	PGN_TP_CM,
	PGN_TP_DT,
	TP_CM_BAM,
	type TransportMessage,
	type TransportProblem
} from './j1939-transport';
import { seededRandom } from './testing/seeded-random';

// Helpers building frames purely from the SAE J1939-21 layout.
const SA = 0x00;
const cmId = buildJ1939Id({
	priority: 7,
	pgn: PGN_TP_CM,
	sourceAddress: SA,
	destinationAddress: 0xff
});
const dtId = buildJ1939Id({
	priority: 7,
	pgn: PGN_TP_DT,
	sourceAddress: SA,
	destinationAddress: 0xff
});

function bamFrames(pgn: number, message: Uint8Array): Uint8Array[] {
	const packets = Math.ceil(message.length / 7);
	const cm = Uint8Array.of(
		TP_CM_BAM,
		message.length & 0xff,
		message.length >> 8,
		packets,
		0xff,
		pgn & 0xff,
		(pgn >> 8) & 0xff,
		pgn >> 16
	);
	const dts = Array.from({ length: packets }, (_, i) => {
		const dt = new Uint8Array(8).fill(0xff); // J1939-21: unused bytes of the last packet are 0xFF
		dt[0] = i + 1;
		dt.set(message.subarray(i * 7, i * 7 + 7), 1);
		return dt;
	});
	return [cm, ...dts];
}

const lampsOff = { state: 'off', flash: 'none' } as const;

describe('BAM transport reassembly (SAE J1939-21) carrying DM1 (SAE J1939-73)', () => {
	const codes = [
		{ spn: 100, fmi: 1, occurrenceCount: 3, conversionMethod: 0 },
		{ spn: 110, fmi: 0, occurrenceCount: 1, conversionMethod: 0 },
		{ spn: 190, fmi: 2, occurrenceCount: 9, conversionMethod: 0 },
		{ spn: 0x40001, fmi: 16, occurrenceCount: 126, conversionMethod: 0 }
	];
	const lamps = {
		malfunctionIndicator: lampsOff,
		redStop: lampsOff,
		amberWarning: { state: 'on', flash: 'slow' },
		protect: lampsOff
	} as const;
	const message = encodeDm1(lamps, codes); // 2 + 4 × 4 = 18 bytes → 3 packets of 7

	it('reassembles a 3-packet DM1 and truncates the 0xFF padding to the announced size', () => {
		expect(message.length).toBe(18);
		const frames = bamFrames(PGN_DM1, message);
		expect(frames).toHaveLength(4);
		const tp = createTransportReassembler();
		// J1939-21: BAM packets are sent 50–200 ms apart (from memory).
		const results = frames.map((f, i) => tp.push(i === 0 ? cmId : dtId, 1 + i * 0.05, f));
		expect(results.slice(0, 3)).toEqual([null, null, null]);
		const done = results[3]!;
		expect(done).toMatchObject({
			mode: 'bam',
			pgn: PGN_DM1,
			sourceAddress: SA,
			destinationAddress: 0xff,
			time: 1.15
		});
		expect(done.data).toEqual(message);
		expect(parseDm1(done.data)).toEqual({ lamps, troubleCodes: codes });
		expect(tp.pending).toBe(0);
	});

	it('rejects an out-of-order packet, reports it and returns no partial message', () => {
		const problems: TransportProblem[] = [];
		const tp = createTransportReassembler({ onProblem: (p) => problems.push(p) });
		const [cm, dt1, dt2, dt3] = bamFrames(PGN_DM1, message);
		expect(tp.push(cmId, 0, cm)).toBeNull();
		expect(tp.push(dtId, 0.05, dt1)).toBeNull();
		expect(tp.push(dtId, 0.1, dt3)).toBeNull(); // packet 2 missing
		expect(tp.push(dtId, 0.15, dt2)).toBeNull(); // late packet of a dropped transfer is ignored
		expect(problems).toEqual([
			expect.objectContaining({ kind: 'outOfOrder', sourceAddress: SA, pgn: PGN_DM1 })
		]);
		expect(problems[0].message).toMatch(/packet 3 arrived, expected 2/);
		expect(tp.pending).toBe(0);
	});

	it('drops a transfer whose packets are further apart than T1 (750 ms, J1939-21, from memory)', () => {
		const problems: TransportProblem[] = [];
		const tp = createTransportReassembler({ onProblem: (p) => problems.push(p) });
		const [cm, dt1, dt2, dt3] = bamFrames(PGN_DM1, message);
		tp.push(cmId, 0, cm);
		tp.push(dtId, 0.05, dt1);
		expect(tp.push(dtId, 1.0, dt2)).toBeNull();
		expect(tp.push(dtId, 1.05, dt3)).toBeNull();
		expect(problems.map((p) => p.kind)).toEqual(['timeout']);
	});

	it('keeps transfers from different source addresses apart', () => {
		const other = 0x3d;
		const cmOther = buildJ1939Id({ priority: 7, pgn: PGN_TP_CM, sourceAddress: other });
		const dtOther = buildJ1939Id({ priority: 7, pgn: PGN_TP_DT, sourceAddress: other });
		const second = encodeDm1(lamps, codes.slice(0, 2)); // 10 bytes → 2 packets
		const a = bamFrames(PGN_DM1, message);
		const b = bamFrames(PGN_DM1, second);
		const tp = createTransportReassembler();
		const out = [
			tp.push(cmId, 0, a[0]),
			tp.push(cmOther, 0.01, b[0]),
			tp.push(dtId, 0.05, a[1]),
			tp.push(dtOther, 0.06, b[1]),
			tp.push(dtId, 0.1, a[2]),
			tp.push(dtOther, 0.11, b[2]),
			tp.push(dtId, 0.15, a[3])
		].filter((m) => m !== null);
		expect(out.map((m) => [m.sourceAddress, m.data.length])).toEqual([
			[other, 10],
			[SA, 18]
		]);
		expect(parseDm1(out[0].data).troubleCodes).toEqual(codes.slice(0, 2));
	});

	it('reports a BAM whose packet count does not fit its size, and a restart mid-transfer', () => {
		const problems: TransportProblem[] = [];
		const tp = createTransportReassembler({ onProblem: (p) => problems.push(p) });
		const [cm, dt1] = bamFrames(PGN_DM1, message);
		const badCm = cm.slice();
		badCm[3] = 2; // 18 bytes cannot fit in 2 packets of 7
		tp.push(cmId, 0, badCm);
		tp.push(cmId, 1, cm);
		tp.push(dtId, 1.05, dt1);
		tp.push(cmId, 1.1, cm);
		expect(problems.map((p) => p.kind)).toEqual(['malformed', 'replaced']);
		expect(tp.pending).toBe(1);
	});

	it('leaves frames to a node to connection mode and ignores unrelated PGNs', () => {
		const tp = createTransportReassembler();
		const rts = Uint8Array.of(16, 18, 0, 3, 0xff, 0xca, 0xfe, 0x00); // control byte 16 = RTS
		const toNode = buildJ1939Id({
			priority: 7,
			pgn: PGN_TP_CM,
			sourceAddress: SA,
			destinationAddress: 0x21
		});
		expect(tp.push(toNode, 0, rts)).toBeNull();
		expect(tp.push(0x0cf00400, 0, new Uint8Array(8))).toBeNull();
		expect(tp.pending).toBe(1); // the RTS opened a connection-mode session, not a BAM
	});

	it('reports a BAM still open when the stream ends', () => {
		const problems: TransportProblem[] = [];
		const tp = createTransportReassembler({ onProblem: (p) => problems.push(p) });
		const [cm, dt1] = bamFrames(PGN_DM1, message);
		tp.push(cmId, 0, cm);
		tp.push(dtId, 0.05, dt1);
		tp.finish(0.1);
		expect(problems).toEqual([
			expect.objectContaining({ kind: 'incomplete', mode: 'bam', pgn: PGN_DM1 })
		]);
		expect(problems[0].message).toMatch(/1 of 3 packets before the capture ended/);
		expect(tp.pending).toBe(0);
	});
});

// ---- Connection mode (RTS/CTS), frames built from the SAE J1939-21 TP.CM / TP.DT layouts ----------

/** Invented node addresses for the hand-built sessions. */
const ORIGINATOR = 0x03;
const RESPONDER = 0x21;
/** A proprietary-A PGN (0xEF00, PDU1) as the payload's PGN; any PGN works the same way. */
const PAYLOAD_PGN = 0xef00;

const tpId = (pgn: number, sa: number, da: number) =>
	buildJ1939Id({ priority: 7, pgn, sourceAddress: sa, destinationAddress: da });
const pgnBytes = (pgn: number) => [pgn & 0xff, (pgn >> 8) & 0xff, pgn >> 16];
// J1939-21 TP.CM: byte 0 control; RTS: size (LSB first), packets, max packets per CTS, PGN.
const rtsData = (size: number, packets: number, pgn = PAYLOAD_PGN, maxPerCts = 0xff) =>
	Uint8Array.of(16, size & 0xff, size >> 8, packets, maxPerCts, ...pgnBytes(pgn));
// CTS: packets that may be sent (0 = hold), next packet number, 2 reserved bytes 0xFF, PGN.
const ctsData = (count: number, next: number, pgn = PAYLOAD_PGN) =>
	Uint8Array.of(17, count, next, 0xff, 0xff, ...pgnBytes(pgn));
// EndOfMsgACK: size, packets, reserved 0xFF, PGN.
const eomData = (size: number, packets: number, pgn = PAYLOAD_PGN) =>
	Uint8Array.of(19, size & 0xff, size >> 8, packets, 0xff, ...pgnBytes(pgn));
// Conn_Abort: reason, 3 reserved bytes 0xFF, PGN.
const abortData = (reason: number, pgn = PAYLOAD_PGN) =>
	Uint8Array.of(255, reason, 0xff, 0xff, 0xff, ...pgnBytes(pgn));
/** TP.DT: sequence number 1…255, then 7 data bytes; the last packet padded with 0xFF. */
function dtData(sequence: number, message: Uint8Array): Uint8Array {
	const dt = new Uint8Array(8).fill(0xff);
	dt[0] = sequence;
	dt.set(message.subarray((sequence - 1) * 7, sequence * 7), 1);
	return dt;
}

interface Frame {
	id: number;
	time: number;
	data: Uint8Array;
}

/**
 * A whole session as the bus carries it: RTS, then per window a CTS from the responder and its
 * packets from the originator, finally the EndOfMsgACK. `skip` leaves packets out (lost on the bus).
 */
function session(
	message: Uint8Array,
	opts: {
		window: number;
		originator?: number;
		responder?: number;
		start?: number;
		gap?: number;
		skip?: number[];
		ack?: boolean;
	}
): Frame[] {
	const o = opts.originator ?? ORIGINATOR;
	const r = opts.responder ?? RESPONDER;
	const gap = opts.gap ?? 0.002;
	const packets = Math.ceil(message.length / 7);
	let time = opts.start ?? 0;
	const frames: Frame[] = [
		{ id: tpId(PGN_TP_CM, o, r), time, data: rtsData(message.length, packets) }
	];
	for (let next = 1; next <= packets; next += opts.window) {
		const count = Math.min(opts.window, packets - next + 1);
		frames.push({ id: tpId(PGN_TP_CM, r, o), time: (time += gap), data: ctsData(count, next) });
		for (let k = next; k < next + count; k++) {
			time += gap;
			if (!opts.skip?.includes(k))
				frames.push({ id: tpId(PGN_TP_DT, o, r), time, data: dtData(k, message) });
		}
	}
	if (opts.ack !== false) {
		frames.push({
			id: tpId(PGN_TP_CM, r, o),
			time: time + gap,
			data: eomData(message.length, packets)
		});
	}
	return frames;
}

function run(frames: Frame[]) {
	const problems: TransportProblem[] = [];
	const tp = createTransportReassembler({ onProblem: (p) => problems.push(p) });
	const messages: TransportMessage[] = [];
	for (const f of frames) {
		const m = tp.push(f.id, f.time, f.data);
		if (m) messages.push(m);
	}
	return { tp, messages, problems };
}

describe('RTS/CTS reassembly (SAE J1939-21 connection mode)', () => {
	const rand = seededRandom(1939);

	it.each([
		[9, 16], // the smallest connection-mode message: 2 packets, the second padded with 0xFF
		[255, 16], // 37 packets in CTS windows of 16, 16 and 5
		[1785, 8] // the largest: 255 packets, 32 windows
	])('reassembles a %d-byte message sent in CTS windows of %d packets', (size, window) => {
		const message = rand.bytes(size);
		const frames = session(message, { window });
		const { tp, messages, problems } = run(frames);
		expect(problems).toEqual([]);
		expect(messages).toHaveLength(1);
		expect(messages[0]).toMatchObject({
			mode: 'rts-cts',
			pgn: PAYLOAD_PGN,
			sourceAddress: ORIGINATOR,
			destinationAddress: RESPONDER,
			time: frames[frames.length - 1].time // returned with the EndOfMsgACK
		});
		expect(messages[0].data).toEqual(message);
		expect(tp.pending).toBe(0);
	});

	it('returns nothing before the EndOfMsgACK, even with every packet in', () => {
		const message = rand.bytes(20);
		const frames = session(message, { window: 16, ack: false });
		const { tp, messages, problems } = run(frames);
		expect(messages).toEqual([]);
		expect(tp.pending).toBe(1);
		tp.finish(frames[frames.length - 1].time + 0.1);
		expect(problems.map((p) => [p.kind, p.mode])).toEqual([['incomplete', 'rts-cts']]);
		expect(problems[0].message).toMatch(/waiting for EndOfMsgACK; 3 of 3 packets/);
	});

	it('follows a hold (CTS of 0 packets) shorter than T4 (1050 ms, J1939-21, from memory)', () => {
		const message = rand.bytes(30); // 5 packets
		const frames = session(message, { window: 3 });
		// Hold after the first window: CTS(0) at 0.02 s, the next CTS 1 s later (< T4), rest shifted.
		const holdAt = frames.findIndex((f, i) => i > 1 && f.data[0] === 17);
		const held = frames.map((f, i) => (i >= holdAt ? { ...f, time: f.time + 1 } : f));
		held.splice(holdAt, 0, {
			id: tpId(PGN_TP_CM, RESPONDER, ORIGINATOR),
			time: frames[holdAt].time - 0.001,
			data: ctsData(0, 0xff)
		});
		const { messages, problems } = run(held);
		expect(problems).toEqual([]);
		expect(messages[0].data).toEqual(message);
	});

	it('reports an abort with its reason code and returns no message', () => {
		const message = rand.bytes(100); // 15 packets
		const frames = session(message, { window: 4 });
		// The responder gives up after the second window: Conn_Abort reason 3 (a timeout occurred).
		const cut = frames.findIndex((f, i) => i > 0 && f.data[0] === 17 && f.data[2] === 9);
		const aborted = [
			...frames.slice(0, cut),
			{ id: tpId(PGN_TP_CM, RESPONDER, ORIGINATOR), time: frames[cut].time, data: abortData(3) },
			...frames.slice(cut + 1) // what the originator sends on is ignored
		];
		const { tp, messages, problems } = run(aborted);
		expect(messages).toEqual([]);
		expect(problems).toEqual([
			expect.objectContaining({
				kind: 'aborted',
				mode: 'rts-cts',
				sourceAddress: ORIGINATOR,
				destinationAddress: RESPONDER,
				pgn: PAYLOAD_PGN,
				abortReason: 3
			})
		]);
		expect(problems[0].message).toMatch(
			/Conn_Abort by the responder, reason 3 \(a timeout occurred\), after 8 of 15 packets/
		);
		expect(ABORT_REASONS[3]).toBe('a timeout occurred');
		expect(tp.pending).toBe(0);
	});

	it('an abort by the originator closes the session too', () => {
		const message = rand.bytes(40);
		const frames = session(message, { window: 2 }).slice(0, 3); // RTS, CTS, packet 1
		frames.push({ id: tpId(PGN_TP_CM, ORIGINATOR, RESPONDER), time: 0.1, data: abortData(2) });
		const { problems } = run(frames);
		expect(problems.map((p) => [p.kind, p.abortReason])).toEqual([['aborted', 2]]);
		expect(problems[0].message).toMatch(/by the originator/);
	});

	it('a lost packet makes the message incomplete, not silently wrong', () => {
		const message = rand.bytes(60); // 9 packets
		const { messages, problems } = run(session(message, { window: 4, skip: [6] }));
		expect(messages).toEqual([]);
		expect(problems).toEqual([expect.objectContaining({ kind: 'incomplete', pgn: PAYLOAD_PGN })]);
		expect(problems[0].message).toMatch(/EndOfMsgACK after 8 of 9 packets; missing 6/);
	});

	it('a lost packet asked for again by a CTS (retransmission) completes the message', () => {
		const message = rand.bytes(60);
		const frames = session(message, { window: 9, skip: [6] });
		const ack = frames.pop()!;
		// The responder asks for packet 6 again; the originator resends it; then the acknowledgement.
		frames.push(
			{ id: tpId(PGN_TP_CM, RESPONDER, ORIGINATOR), time: ack.time, data: ctsData(1, 6) },
			{
				id: tpId(PGN_TP_DT, ORIGINATOR, RESPONDER),
				time: ack.time + 0.002,
				data: dtData(6, message)
			},
			{ ...ack, time: ack.time + 0.004 }
		);
		const { messages, problems } = run(frames);
		expect(problems).toEqual([]);
		expect(messages[0].data).toEqual(message);
	});

	it('keeps interleaved sessions of two address pairs apart', () => {
		const a = rand.bytes(255);
		const b = rand.bytes(64);
		const first = session(a, { window: 16, start: 0, gap: 0.003 });
		// A second pair, and the first pair's responder sending to its originator the other way round.
		const second = session(b, { window: 5, originator: 0x42, responder: 0x17, start: 0.001 });
		const reverse = session(b, {
			window: 3,
			originator: RESPONDER,
			responder: ORIGINATOR,
			start: 0.0015
		});
		const frames = [...first, ...second, ...reverse].sort((x, y) => x.time - y.time);
		const { tp, messages, problems } = run(frames);
		expect(problems).toEqual([]);
		expect(
			messages.map((m) => [m.sourceAddress, m.destinationAddress, m.data.length]).sort()
		).toEqual(
			[
				[ORIGINATOR, RESPONDER, 255],
				[0x42, 0x17, 64],
				[RESPONDER, ORIGINATOR, 64]
			].sort()
		);
		for (const m of messages) expect(m.data).toEqual(m.data.length === 255 ? a : b);
		expect(tp.pending).toBe(0);
	});
});

describe('RTS/CTS timeouts (SAE J1939-21 T1–T4, from memory)', () => {
	const message = seededRandom(4).bytes(50); // 8 packets
	const unrelated = { id: 0x0cf00400, data: new Uint8Array(8) };

	function timedOut(frames: Frame[], until: number) {
		const { tp, problems } = run([...frames, { ...unrelated, time: until }]);
		return { tp, problems };
	}

	it('T3: no CTS within 1250 ms of the RTS', () => {
		const { tp, problems } = timedOut(session(message, { window: 8 }).slice(0, 1), 1.3);
		expect(problems.map((p) => [p.kind, p.time])).toEqual([['timeout', 1.25]]);
		expect(problems[0].message).toMatch(/no CTS within T3 \(1\.25\); 0 of 8 packets/);
		expect(tp.pending).toBe(0);
	});

	it('T2: no packet within 1250 ms of a CTS; a wait just inside the limit is fine', () => {
		const frames = session(message, { window: 8 }).slice(0, 2); // RTS, CTS at 0.002
		expect(timedOut(frames, 1.25).problems).toEqual([]);
		const { problems } = timedOut(frames, 1.26);
		expect(problems.map((p) => p.kind)).toEqual(['timeout']);
		expect(problems[0].message).toMatch(/first packet of the window \(1\) within T2/);
	});

	it('T1: more than 750 ms between packets of a window; the late packet is not used', () => {
		const frames = session(message, { window: 8 });
		const late = frames.map((f, i) => (i >= 4 ? { ...f, time: f.time + 0.8 } : f));
		const { messages, problems } = run(late);
		expect(messages).toEqual([]);
		expect(problems.map((p) => p.kind)).toEqual(['timeout']);
		expect(problems[0].message).toMatch(/no packet 3 within T1 \(0\.75\); 2 of 8 packets/);
	});

	it('T4: a hold (CTS of 0) longer than 1050 ms', () => {
		const frames = session(message, { window: 8 }).slice(0, 1);
		frames.push({ id: tpId(PGN_TP_CM, RESPONDER, ORIGINATOR), time: 0.01, data: ctsData(0, 0xff) });
		const { problems } = timedOut(frames, 1.1);
		expect(problems.map((p) => [p.kind, p.time])).toEqual([['timeout', 1.06]]);
		expect(problems[0].message).toMatch(/after the hold within T4/);
	});

	it('takes other deadlines when given (e.g. a capture in milliseconds)', () => {
		const problems: TransportProblem[] = [];
		const tp = createTransportReassembler({
			onProblem: (p) => problems.push(p),
			connectionTimeouts: { t3: 1250 }
		});
		const [rts] = session(message, { window: 8 });
		tp.push(rts.id, 0, rts.data);
		tp.push(unrelated.id, 1000, unrelated.data);
		expect(problems).toEqual([]);
		tp.push(unrelated.id, 1300, unrelated.data);
		expect(problems.map((p) => p.kind)).toEqual(['timeout']);
	});
});

describe('RTS/CTS bad input', () => {
	it('refuses an RTS outside 9…1785 bytes or with a packet count that does not fit', () => {
		const to = tpId(PGN_TP_CM, ORIGINATOR, RESPONDER);
		const { tp, problems } = run([
			{ id: to, time: 0, data: rtsData(8, 2) },
			{ id: to, time: 0.1, data: rtsData(1786, 255) },
			{ id: to, time: 0.2, data: rtsData(100, 14) }
		]);
		expect(problems.map((p) => p.kind)).toEqual(['malformed', 'malformed', 'malformed']);
		expect(problems[0].message).toMatch(/8 bytes in 2 packets; expected 9…1785 bytes/);
		expect(tp.pending).toBe(0);
	});

	it('reports a packet outside the granted window, an RTS to the global address and a BAM to a node', () => {
		const message = seededRandom(8).bytes(30);
		const frames = session(message, { window: 2 });
		// Packet 3 sent while only 1…2 were granted.
		const wrong = [...frames.slice(0, 3), { ...frames[3], data: dtData(3, message) }];
		const { problems } = run([
			...wrong,
			{ id: tpId(PGN_TP_CM, 0x05, 0xff), time: 1, data: rtsData(30, 5) },
			{
				id: tpId(PGN_TP_CM, 0x05, 0x21),
				time: 1.1,
				data: Uint8Array.of(TP_CM_BAM, 30, 0, 5, 0xff, 0, 0xef, 0)
			}
		]);
		expect(problems.map((p) => [p.kind, p.mode])).toEqual([
			['outOfOrder', 'rts-cts'],
			['malformed', 'rts-cts'],
			['malformed', 'bam']
		]);
		expect(problems[0].message).toMatch(/packet 3 arrived, expected 2…2 in order/);
	});

	it('a second RTS on the same pair replaces the first', () => {
		const message = seededRandom(9).bytes(30);
		const frames = session(message, { window: 8 });
		const again = session(message, { window: 8, start: 0.001 });
		const { messages, problems } = run([frames[0], ...again]);
		expect(problems.map((p) => p.kind)).toEqual(['replaced']);
		expect(messages).toHaveLength(1);
	});
});
