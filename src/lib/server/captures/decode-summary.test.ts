// The JSON summary of a decode, checked on the genset demo capture (invented data) against the CSV
// text read by hand with the byte layouts of the standards: DM1 (SAE J1939-73: lamp byte, then
// 4-byte trouble codes SPN low/mid, SPN high 3 bits + FMI 5 bits, CM + OC 7 bits — from memory)
// and BAM transfers (SAE J1939-21: TP.CM bytes 1–2 = size little-endian, TP.DT byte 0 = sequence
// number, 7 data bytes each — from memory).
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { decodeCapture } from '$lib/can/capture/decode-capture';
import { ingestCapture } from '$lib/can/capture/ingest';
import { compileMap } from '$lib/can/decoder';
import { parseMap } from '$lib/can/map-json';
import { summarizeDecoding } from './decode-summary';
import { undocumentedFrame, undocumentedFrameName } from './undocumented-frame';

const fixture = (name: string) =>
	readFileSync(new URL(`../../../../fixtures/${name}`, import.meta.url), 'utf8');

const rows = fixture('genset-idle.csv')
	.trim()
	.split('\n')
	.slice(1)
	.map((line) => {
		const [time, id, , , data] = line.split(',');
		return {
			time: Number(time),
			id: Number.parseInt(id, 16),
			bytes: data.split(' ').map((b) => Number.parseInt(b, 16))
		};
	});
const t0 = rows[0].time;
const hex = (bytes: number[]) =>
	bytes.map((b) => b.toString(16).toUpperCase().padStart(2, '0')).join(' ');

async function gensetSummary() {
	const map = parseMap(fixture('genset-j1939.map.json'));
	if (!map.ok) throw new Error('the genset fixture map must parse');
	const { store } = await ingestCapture(fixture('genset-idle.csv'));
	return summarizeDecoding(decodeCapture(store, compileMap(map.map)));
}

describe('summarizeDecoding', () => {
	it('lists reassembled BAM messages with the bytes a hand reassembly of the CSV gives', async () => {
		const summary = await gensetSummary();
		const expected: { time: number; pgn: number; dataHex: string }[] = [];
		let open: { size: number; pgn: number; bytes: number[] } | null = null;
		for (const r of rows) {
			if (r.id === 0x1cecff00 && r.bytes[0] === 32)
				open = {
					size: r.bytes[1] | (r.bytes[2] << 8),
					pgn: r.bytes[5] | (r.bytes[6] << 8) | (r.bytes[7] << 16),
					bytes: []
				};
			else if (r.id === 0x1cebff00 && open) {
				open.bytes.push(...r.bytes.slice(1));
				if (open.bytes.length >= open.size) {
					expected.push({
						time: r.time - t0,
						pgn: open.pgn,
						dataHex: hex(open.bytes.slice(0, open.size))
					});
					open = null;
				}
			}
		}
		expect(expected.length).toBeGreaterThan(0);
		expect(summary.j1939!.messages.map((m) => m.pgn)).toEqual(expected.map((e) => e.pgn));
		expect(summary.j1939!.messages.map((m) => m.dataHex)).toEqual(expected.map((e) => e.dataHex));
		summary.j1939!.messages.forEach((m, k) => expect(m.time).toBeCloseTo(expected[k].time, 9));
	});

	it('lists each distinct trouble code once, first seen time and the lamps of its latest report', async () => {
		const summary = await gensetSummary();
		const dm1 = rows.filter((r) => r.id === 0x18feca00 && r.bytes.slice(2, 6).some((b) => b !== 0));
		const first = dm1[0];
		const spn = first.bytes[2] | (first.bytes[3] << 8) | ((first.bytes[4] >> 5) << 16);
		const code = summary.j1939!.troubleCodes.find((c) => c.spn === spn)!;
		expect(code).toMatchObject({
			sourceAddress: 0x00,
			fmi: first.bytes[4] & 0x1f,
			occurrenceCount: first.bytes[5] & 0x7f
		});
		expect(code.time).toBeCloseTo(first.time - t0, 9);
		// Lamp byte 0x04: bits 3–2 = 01, amber warning lamp on (J1939-73, from memory).
		expect(first.bytes[0]).toBe(0x04);
		expect(code.lamps.amberWarning.state).toBe('on');
		expect(
			new Set(summary.j1939!.troubleCodes.map((c) => `${c.sourceAddress}:${c.spn}:${c.fmi}`)).size
		).toBe(summary.j1939!.troubleCodes.length);
	});

	it('is plain JSON: arrays, no NaN, unknown IDs carry their rate', async () => {
		const summary = await gensetSummary();
		expect(JSON.parse(JSON.stringify(summary))).toEqual(summary);
		for (const u of summary.unknownIds) {
			const seen = rows.filter((r) => r.id === u.id);
			expect(u.count).toBe(seen.length);
			// frames per second over the span between the first and last frame
			expect(u.rateHz).toBeCloseTo(
				(seen.length - 1) / (seen[seen.length - 1].time - seen[0].time),
				6
			);
			expect(u.bitChanges).toHaveLength(8 * u.maxLength);
		}
	});
});

describe('undocumentedFrame', () => {
	const seen = {
		id: 0x18ff1027,
		extended: true,
		count: 300,
		firstTime: 0,
		lastTime: 29.9,
		rateHz: 10,
		meanPeriodMs: 99.6,
		jitterMs: 0.2,
		minLength: 6,
		maxLength: 6,
		frameIndex: null,
		frameName: null,
		cycleMs: null
	};

	it('names the ID, rounds the period and takes the longest payload seen', () => {
		expect(undocumentedFrame(seen, 'idle.csv')).toMatchObject({
			name: 'Undocumented_0x18FF1027',
			id: 0x18ff1027,
			extended: true,
			length: 6,
			cycleMs: 100,
			signals: []
		});
		expect(undocumentedFrameName(0x5f8, false)).toBe('Undocumented_0x5F8');
	});

	it('rounds a CAN FD payload up to a length a frame can declare (ISO 11898-1: 12, 16, 20, 24, 32, 48, 64)', () => {
		expect(undocumentedFrame({ ...seen, maxLength: 10 }, 'x').length).toBe(12);
		expect(undocumentedFrame({ ...seen, maxLength: 33 }, 'x').length).toBe(48);
	});

	it('leaves the cycle time empty for a lone frame or a sub-millisecond period', () => {
		expect(undocumentedFrame({ ...seen, meanPeriodMs: null }, 'x').cycleMs).toBeNull();
		expect(undocumentedFrame({ ...seen, meanPeriodMs: 0.3 }, 'x').cycleMs).toBeNull();
	});
});
