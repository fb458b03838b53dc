import { linearRegression, sampleCorrelation, sampleRankCorrelation } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { insertRaw } from '../bits';
import { seededRandom } from '../testing/seeded-random';
import { idFramesFromPayloads, type IdFrames } from './frames';
import {
	candidatesFromProposals,
	correlateFields,
	type CandidateField,
	type ChannelSamples
} from './correlate';
import type { FieldProposal } from './proposal';

/** A smooth engine-speed-like signal, 800…6000 rpm: a few slow sines with seeded phases. */
function smoothSignal(seed: number, low: number, high: number) {
	const rand = seededRandom(seed);
	const waves = [0.05, 0.13, 0.31].map((hz) => ({ hz, phase: rand.next() * 2 * Math.PI }));
	return (t: number) => {
		const s = waves.reduce((sum, w) => sum + Math.sin(2 * Math.PI * w.hz * t + w.phase), 0) / 3;
		return low + ((s + 1) / 2) * (high - low);
	};
}

const SCALE = 0.25;
const OFFSET = 400;
const rpm = smoothSignal(1, 800, 6000);
const other = smoothSignal(2, 0, 100);

/** The known channel: 100 Hz samples of the signal over 60 s. */
function knownChannel(skip?: [number, number]): ChannelSamples {
	const time: number[] = [];
	for (let k = 0; k <= 6000; k++) {
		const t = k * 0.01;
		if (skip && t > skip[0] && t < skip[1]) continue;
		time.push(t);
	}
	return { time: Float64Array.from(time), value: Float64Array.from(time, rpm) };
}

/**
 * The unknown ID at 50 Hz, 3 ms after the channel's samples: bytes 0–1 the signal as raw with
 * physical = raw × 0.25 + 400 (the planted linear field), byte 2 noise, bytes 3–4 an unrelated
 * signal, bytes 5–6 (big-endian) the square of the signal / 1000 (monotonic, not linear).
 */
function unknownFrames(): IdFrames {
	const rand = seededRandom(3);
	const times: number[] = [];
	const payloads: Uint8Array[] = [];
	for (let k = 0; k < 3000; k++) {
		const t = 0.003 + k * 0.02;
		const p = new Uint8Array(8);
		insertRaw(p, 0, 16, 'little', BigInt(Math.round((rpm(t) - OFFSET) / SCALE)));
		p[2] = rand.int(0, 255);
		insertRaw(p, 24, 16, 'little', BigInt(Math.round(other(t) * 100)));
		insertRaw(p, 48, 16, 'big', BigInt(Math.round(rpm(t) ** 2 / 1000)));
		times.push(t);
		payloads.push(p);
	}
	return idFramesFromPayloads(0x5e1, false, times, payloads);
}

const field = (startBit: number, length: number, byteOrder: 'little' | 'big'): CandidateField => ({
	id: 0x5e1,
	extended: false,
	startBit,
	length,
	byteOrder,
	signed: false,
	page: null
});

describe('correlateFields', () => {
	const frames = unknownFrames();
	const candidates = [
		field(16, 8, 'little'),
		field(24, 16, 'little'),
		field(48, 16, 'big'),
		field(0, 16, 'little')
	].map((f) => ({ field: f, frames }));

	it('ranks the planted linear field first and recovers its scale and offset within 0.1 %', () => {
		const [best, ...rest] = correlateFields(knownChannel(), candidates);
		expect(best.field).toEqual(field(0, 16, 'little'));
		expect(best.samples).toBe(3000);
		expect(best.pearson!).toBeGreaterThan(0.9999);
		expect(Math.abs(best.scale! / SCALE - 1)).toBeLessThan(0.001);
		expect(Math.abs(best.offset! / OFFSET - 1)).toBeLessThan(0.001);
		// The square is perfectly monotonic (Spearman 1) but not linear; the noise byte is unrelated.
		const square = rest.find((r) => r.field.startBit === 48)!;
		expect(square.spearman!).toBeCloseTo(1, 6);
		expect(square.pearson!).toBeLessThan(square.spearman!);
		const noise = rest.find((r) => r.field.startBit === 16)!;
		expect(Math.abs(noise.pearson!)).toBeLessThan(0.1);
		expect(rest.at(-1)!.field.startBit).toBe(16);
	});

	it('gives the statistics simple-statistics computes on the same pairs', () => {
		// With maxPoints above the sample count the scatter holds every pair that was scored.
		for (const r of correlateFields(knownChannel(), candidates, { maxPoints: 10_000 })) {
			const x = Array.from(r.scatter.raw);
			const y = Array.from(r.scatter.channel);
			expect(x).toHaveLength(r.samples);
			expect(r.pearson!).toBeCloseTo(sampleCorrelation(x, y), 9);
			// simple-statistics ranks ties by their mid-rank, as Spearman's ρ requires.
			expect(r.spearman!).toBeCloseTo(sampleRankCorrelation(x, y), 9);
			const line = linearRegression(x.map((v, i) => [v, y[i]]));
			expect(r.scale!).toBeCloseTo(line.m, 9);
			expect(r.offset!).toBeCloseTo(line.b, 6);
			const residual = Math.sqrt(
				x.reduce((sum, v, i) => sum + (y[i] - (line.m * v + line.b)) ** 2, 0) / x.length
			);
			expect(r.residual!).toBeCloseTo(residual, 6);
		}
	});

	it('interpolates the channel linearly between its samples', () => {
		// A channel that is exactly linear in time: interpolation must reproduce it at the frame times.
		const time = Float64Array.from({ length: 601 }, (_, k) => k * 0.1);
		const channel = { time, value: time.map((t) => 10 + 3 * t) };
		const [r] = correlateFields(channel, [{ field: field(0, 16, 'little'), frames }], {
			maxPoints: 10_000
		});
		r.scatter.channel.forEach((c, i) => {
			expect(c).toBeCloseTo(10 + 3 * frames.time[i], 9);
		});
	});

	it('leaves out frame times inside a channel gap and outside its span', () => {
		// Channel missing from 20 s to 25 s; default longest gap = 5 × the 10 ms spacing.
		const results = correlateFields(knownChannel([20, 25]), candidates);
		const inGap = Array.from(frames.time).filter((t) => t > 19.99 && t < 25).length;
		expect(results[0].samples).toBe(3000 - inGap);
		// Frames after the channel's last sample are left out too.
		const short = { time: Float64Array.of(0, 10), value: Float64Array.of(1, 2) };
		const [r] = correlateFields(short, [{ field: field(0, 16, 'little'), frames }], { maxGap: 20 });
		expect(r.samples).toBe(Array.from(frames.time).filter((t) => t <= 10).length);
	});

	it('thins the scatter to maxPoints pairs', () => {
		const [r] = correlateFields(knownChannel(), candidates, { maxPoints: 500 });
		expect(r.scatter.raw).toHaveLength(500);
		expect(r.scatter.channel).toHaveLength(500);
	});

	it('reads a page field only from the frames of its page', () => {
		// Selector in bits 0–1: page 1 carries the signal in bytes 1–2, page 0 carries noise there.
		const rand = seededRandom(4);
		const times: number[] = [];
		const payloads: Uint8Array[] = [];
		for (let k = 0; k < 2000; k++) {
			const t = 0.005 + k * 0.02;
			const p = new Uint8Array(3);
			p[0] = k % 2;
			const raw = k % 2 ? Math.round((rpm(t) - OFFSET) / SCALE) : rand.int(0, 65535);
			insertRaw(p, 8, 16, 'little', BigInt(raw));
			times.push(t);
			payloads.push(p);
		}
		const paged = idFramesFromPayloads(1, false, times, payloads);
		const onPage = { ...field(8, 16, 'little'), page: { startBit: 0, length: 2, value: 1 } };
		const [withPage] = correlateFields(knownChannel(), [{ field: onPage, frames: paged }]);
		expect(withPage.samples).toBe(1000);
		expect(withPage.pearson!).toBeGreaterThan(0.9999);
		const [everyFrame] = correlateFields(knownChannel(), [
			{ field: field(8, 16, 'little'), frames: paged }
		]);
		expect(everyFrame.samples).toBe(2000);
		expect(everyFrame.pearson!).toBeLessThan(0.9);
	});

	it('scores nothing for a field that never changes', () => {
		const flat = idFramesFromPayloads(
			1,
			false,
			[0.1, 0.2, 0.3, 0.4],
			[Uint8Array.of(7), Uint8Array.of(7), Uint8Array.of(7), Uint8Array.of(7)]
		);
		const [r] = correlateFields(knownChannel(), [{ field: field(0, 8, 'little'), frames: flat }]);
		expect(r).toMatchObject({ samples: 4, pearson: null, spearman: null, scale: null });
	});
});

describe('candidatesFromProposals', () => {
	it('turns value proposals into candidates, keeping the page of a multiplexed one', () => {
		const common = { confidence: 0.9, evidence: '', rawMin: 0, rawMax: 1, flipRates: [] };
		const fields: FieldProposal[] = [
			{
				kind: 'mux',
				startBit: 0,
				length: 2,
				byteOrder: 'little',
				confidence: 0.9,
				muxValue: null,
				evidence: '',
				pages: [],
				switchedBits: [],
				counterStep: null
			},
			{
				kind: 'value',
				startBit: 8,
				length: 8,
				byteOrder: 'little',
				muxValue: null,
				signed: false,
				...common
			},
			{
				kind: 'value',
				startBit: 16,
				length: 12,
				byteOrder: 'big',
				muxValue: 2,
				signed: true,
				...common
			}
		];
		expect(candidatesFromProposals({ id: 9, extended: true }, fields)).toEqual([
			{
				id: 9,
				extended: true,
				startBit: 8,
				length: 8,
				byteOrder: 'little',
				signed: false,
				page: null
			},
			{
				id: 9,
				extended: true,
				startBit: 16,
				length: 12,
				byteOrder: 'big',
				signed: true,
				page: { startBit: 0, length: 2, value: 2 }
			}
		]);
	});
});
