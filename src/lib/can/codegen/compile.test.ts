/**
 * The generated C, compiled with the machine's gcc and run over random payloads in one batch, against
 * codec.ts (the app's decoding) and an independent bit-by-bit reference. Skipped, saying so, without gcc.
 */
import { execFile, spawnSync } from 'node:child_process';
import { promisify } from 'node:util';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { extractRaw, fieldLayout, readUnsigned32, type FieldLayout } from '../bits';
import { decodeFrame } from '../codec';
import { compileMap, SIGNAL_STATUS } from '../decoder';
import { canMapSchema, type CanMap } from '../map';
import {
	compileTestMap,
	harnessSource,
	makeRecords,
	recordCount,
	referenceEncode
} from '../testing/codegen-harness';
import { referenceExtract } from '../testing/reference-bits';
import { seededRandom } from '../testing/seeded-random';
import { generateC, type GeneratedFrame } from './generate';

const HAS_GCC = spawnSync('gcc', ['--version']).status === 0;
const HAS_GXX = spawnSync('g++', ['--version']).status === 0;
if (!HAS_GCC)
	console.warn('gcc is not installed: the compiled checks of the generated C are skipped');

/** The flags, plus -pedantic and the conversion/shadowing warnings firmware builds often turn on. */
const STRICT = [
	'-std=c99',
	'-Wall',
	'-Wextra',
	'-Werror',
	'-pedantic',
	'-Wconversion',
	'-Wsign-conversion',
	'-Wshadow',
	'-Wdouble-promotion',
	'-Wcast-qual',
	'-Wmissing-prototypes',
	'-Wstrict-prototypes',
	'-O2'
];

const dir = mkdtempSync(join(tmpdir(), 'fw-codegen-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function run(command: string, args: string[], input?: Uint8Array) {
	const result = spawnSync(command, args, { cwd: dir, input, maxBuffer: 1 << 30 });
	if (result.status !== 0)
		throw new Error(`${command} ${args.join(' ')} failed (${result.status}):\n${result.stderr}`);
	return result.stdout;
}

/** A compiler run in the background, so the test prepares its records meanwhile. */
const runAsync = (command: string, args: string[]) =>
	promisify(execFile)(command, args, { cwd: dir }).catch((error: { stderr?: string }) => {
		throw new Error(`${command} ${args.join(' ')} failed:\n${error.stderr ?? error}`);
	});

/**
 * Generates `<prefix>.h/.c`, compiles the code with STRICT flags (and the header as C++ where g++ is
 * installed), links it with a harness; resolves to the program's path.
 */
function build(prefix: string, map: CanMap, harness: (frames: GeneratedFrame[]) => string) {
	const generated = generateC(map, { prefix, mapName: map.name, generatorVersion: 'test' });
	writeFileSync(join(dir, `${prefix}.h`), generated.header);
	writeFileSync(join(dir, `${prefix}.c`), generated.source);
	writeFileSync(join(dir, `${prefix}-harness.c`), harness(generated.frames));
	const cxx = HAS_GXX
		? runAsync('g++', ['-fsyntax-only', '-Wall', '-Wextra', '-Werror', '-x', 'c++', `${prefix}.h`])
		: Promise.resolve();
	// The harness is test code: compiled quickly, without the strict set.
	const program = Promise.all([
		runAsync('gcc', [...STRICT, '-c', `${prefix}.c`, '-o', `${prefix}.o`]),
		runAsync('gcc', ['-std=c99', '-O0', '-c', `${prefix}-harness.c`, '-o', `${prefix}-harness.o`]),
		cxx
	])
		.then(() => runAsync('gcc', [`${prefix}-harness.o`, `${prefix}.o`, '-o', prefix]))
		.then(() => join(dir, prefix));
	return { program, generated };
}

/** Reads the harness output front to back. */
function reader(bytes: Uint8Array) {
	const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
	let at = 0;
	return {
		i8: () => view.getInt8(at++),
		u8: () => view.getUint8(at++),
		u32: () => ((at += 4), view.getUint32(at - 4, true)),
		/** The low 32 bits of a two's complement 64-bit word as a number (encode's small result). */
		i64: () => ((at += 8), view.getInt32(at - 8, true)),
		f64: () => ((at += 8), view.getFloat64(at - 8, true)),
		bytes: (n: number) => ((at += n), bytes.subarray(at - n, at)),
		done: () => at === bytes.length
	};
}

const sameDouble = (a: number, b: number) =>
	Object.is(a, b) || (Number.isNaN(a) && Number.isNaN(b));

/** decode's "left alone" marker: the harness fills the struct with 0xFF bytes first. */
const marker = new DataView(new ArrayBuffer(8));
function isUntouched(value: number): boolean {
	marker.setFloat64(0, value);
	return marker.getUint32(0) === 0xffffffff && marker.getUint32(4) === 0xffffffff;
}

/**
 * A field's raw value as the low and high 32-bit words of its two's complement 64-bit form, read with
 * bits.ts's readUnsigned32 (the codec's own primitive) in two parts, so no BigInt is needed per payload.
 */
function rawWords(data: Uint8Array, layout: FieldLayout, signed: boolean): [number, number] {
	const { lsbByte, shift, length, step } = layout;
	if (length <= 32) {
		const u = readUnsigned32(data, 0, lsbByte, shift, length, step);
		const negative = signed && u >= 2 ** (length - 1);
		return [negative ? (u - 2 ** length) >>> 0 : u, negative ? 0xffffffff : 0];
	}
	const low = readUnsigned32(data, 0, lsbByte, shift, 32, step);
	const high = readUnsigned32(data, 0, lsbByte + 4 * step, shift, length - 32, step);
	const negative = signed && high >= 2 ** (length - 33);
	return [low, negative ? (high - 2 ** (length - 32)) >>> 0 : high];
}

describe.skipIf(!HAS_GCC)('generated C compiled with gcc', () => {
	it('compiles warning-free and decodes and encodes exactly as codec.ts on ≥ 10,000 random payloads per signal', async () => {
		const started = performance.now();
		const rng = seededRandom(0xc0de13);
		const map = compileTestMap(rng);
		const perSignal = 10_000;
		const { program, generated } = build('fw', map, (frames) =>
			harnessSource(
				'fw',
				frames,
				frames.map((g) => recordCount(g, map, perSignal))
			)
		);
		const frames = generated.frames;
		const records = frames.map((g) => makeRecords(g, map, recordCount(g, map, perSignal), rng));
		const input = Buffer.concat(records.map((r) => r.buffer));
		const preparedAt = performance.now();
		const executable = await program;
		const compiledAt = performance.now();
		const out = reader(run(executable, [], input));
		const ranAt = performance.now();

		const problems: string[] = [];
		const problem = (text: string) => {
			if (problems.length < 20) problems.push(text);
		};
		// decoder.ts (the app's compiled decoder) answers for every payload; codec.ts's decodeFrame and
		// extractRaw and the bit-string reference of testing/reference-bits.ts for the first records of each frame.
		const compiled = compileMap(map, { codegen: false });
		const CROSS_CHECKED = 200;
		const decoded = frames.map((g) => g.signals.map(() => 0));
		const encoded = frames.map((g) => g.signals.map(() => 0));
		let payloads = 0;
		let crossChecks = 0;
		let refusals = 0;
		let clampedTotal = 0;

		frames.forEach((g, f) => {
			const frame = map.frames[g.index];
			const L = frame.length;
			const signals = g.signals.map((s) => frame.signals[s.index]);
			const layouts = signals.map((s) => fieldLayout(s.startBit, s.length, s.byteOrder));
			const channels = new Float64Array(frame.signals.length);
			const status = new Uint8Array(frame.signals.length);
			// codec.ts refuses to decode a float of the wrong length; every other signal stays in the frame.
			const decodable = frame.signals.filter(
				(s) =>
					(s.valueType !== 'float32' || s.length === 32) &&
					(s.valueType !== 'float64' || s.length === 64)
			);
			const mux = frame.signals.find((s) => s.multiplexer);
			const muxLayout = mux && fieldLayout(mux.startBit, mux.length, mux.byteOrder);
			for (let r = 0; r < records[f].count; r++) {
				const payload = records[f].payload(r);
				const where = () => `${frame.name} record ${r}`;
				payloads++;
				compiled.frames[g.index].decode(payload, 0, L, channels, 0, status);
				const codec = r < CROSS_CHECKED ? decodeFrame({ signals: decodable }, payload) : null;
				if (out.i8() !== 0) problem(`${where()}: decode refused a full-length payload`);
				if (out.i8() !== (L > 0 ? -1 : 0)) problem(`${where()}: short decode not refused`);
				if (g.page && mux && muxLayout) {
					const [lo, hi] = [out.u32(), out.u32()];
					const [wantLo, wantHi] = rawWords(payload, muxLayout, mux.valueType === 'signed');
					if (lo !== wantLo || hi !== wantHi)
						problem(`${where()}: page ${hi}:${lo}, raw ${wantHi}:${wantLo}`);
				}
				signals.forEach((signal, k) => {
					const value = out.f64();
					const [lo, hi] = [out.u32(), out.u32()];
					// Raw bits, bit-exact as two 32-bit words (two's complement for signed fields).
					const [wantLo, wantHi] = rawWords(payload, layouts[k], signal.valueType === 'signed');
					if (lo !== wantLo || hi !== wantHi)
						problem(`${where()} ${signal.name}: raw ${hi}:${lo}, expected ${wantHi}:${wantLo}`);
					const present = status[g.signals[k].index] !== SIGNAL_STATUS.absent;
					const want = channels[g.signals[k].index];
					if (codec) {
						crossChecks++;
						const bits = extractRaw(payload, signal.startBit, signal.length, signal.byteOrder);
						const slow = referenceExtract(
							payload,
							signal.startBit,
							signal.length,
							signal.byteOrder
						);
						const c64 = (BigInt(hi) << 32n) | BigInt(lo);
						const word =
							signal.valueType === 'signed'
								? BigInt.asUintN(64, BigInt.asIntN(signal.length, bits))
								: bits;
						if (slow !== bits || c64 !== word)
							problem(`${where()} ${signal.name}: C ${c64}, codec ${word}, bit strings ${slow}`);
						const result = codec[decodable.indexOf(signal)];
						if (result.present !== present || (result.present && !sameDouble(result.value, want)))
							problem(`${where()} ${signal.name}: codec.ts and decoder.ts disagree`);
					}
					if (present) {
						decoded[f][k]++;
						// Same expression on both sides (raw × scale + offset in binary64): exact equality.
						if (!sameDouble(value, want))
							problem(`${where()} ${signal.name}: C ${value}, TypeScript ${want}`);
					} else if (!isUntouched(value)) {
						problem(`${where()} ${signal.name}: written although absent on this page`);
					}
				});
				if (out.i8() !== -1) problem(`${where()}: short encode not refused`);
				if (out.u8() !== 1) problem(`${where()}: short encode touched the buffer`);
				const data = records[f].background(r).slice();
				const want = referenceEncode(g, map, records[f].values(r), data);
				const got = out.i64();
				const bytes = out.bytes(L);
				if (got !== want.result) problem(`${where()}: encode gave ${got}, codec ${want.result}`);
				if (!bytes.every((b, i) => b === data[i]))
					problem(`${where()}: encoded [${bytes}] but codec [${data}]`);
				if (want.result === -2) refusals++;
				else clampedTotal += want.result;
				for (const k of want.written) encoded[f][k]++;
			}
		});
		const comparedAt = performance.now();
		const total = (counts: number[][]) => counts.flat().reduce((a, b) => a + b, 0);
		const seconds = (from: number, to: number) => `${((to - from) / 1000).toFixed(1)} s`;
		console.info(
			`codegen: ${frames.length} frames, ${payloads} payloads; ${total(decoded)} signal decodes and ` +
				`${total(encoded)} signal encodes compared (${crossChecks} also against codec.ts and the ` +
				`bit-string reference); ${refusals} encodes refused, ${clampedTotal} values clamped; ` +
				`generate and make records ${seconds(started, preparedAt)}, compile until ${seconds(started, compiledAt)}, ` +
				`C run ${seconds(compiledAt, ranAt)}, ` +
				`compare ${seconds(ranAt, comparedAt)}`
		);

		expect(problems).toEqual([]);
		expect(out.done()).toBe(true);
		expect(Math.min(...decoded.flat())).toBeGreaterThanOrEqual(perSignal);
		const encodable = encoded.flatMap((counts, f) =>
			counts.filter((_, k) => frames[f].signals[k].encoded)
		);
		expect(Math.min(...encodable)).toBeGreaterThanOrEqual(perSignal);
		// Both kinds of trouble really happened in the run.
		expect(refusals).toBeGreaterThan(100);
		expect(clampedTotal).toBeGreaterThan(1000);
	}, 180_000);
});

describe.skipIf(!HAS_GCC)('J1939 match helper compiled with gcc', () => {
	// The frames a J1939 build would define (IDs with source address 0x00 or 0xF9).
	const map = canMapSchema.parse({
		format: 'framewright-map@1',
		name: 'J1939 match',
		frames: [
			{ name: 'EEC1', id: '0x0CF00400', extended: true, j1939: true },
			{ name: 'CCVS', id: '0x18FEF100', extended: true, j1939: true },
			{ name: 'Request', id: '0x18EA00F9', extended: true, j1939: true, length: 3 },
			{ name: 'DataPage1', id: '0x19FEF100', extended: true, j1939: true }
		]
	});
	// SAE J1939-21 (from memory): ID = priority (3 bits) | EDP | DP | PF (8) | PS (8) | SA (8);
	// PGN = EDP, DP, PF and — only when PF ≥ 240 (PDU2) — PS; for PDU1 (PF < 240) PS is a destination.
	// EEC1 is PGN 61444 (0xF004), CCVS 65265 (0xFEF1), Request 59904 (0xEA00) (SAE J1939-71/-21, from memory).
	const cases: [string, number, number, string[]][] = [
		['EEC1 from SA 0x00, priority 3', 0x0cf00400, 0xf004, ['EEC1']],
		['EEC1 from SA 0x01, priority 6', 0x18f00401, 0xf004, ['EEC1']],
		['CCVS from SA 0x17', 0x18fef117, 0xfef1, ['CCVS']],
		['PDU2 with another group extension', 0x18fef200, 0xfef2, []],
		['Request to SA 0x00', 0x18ea00f9, 0xea00, ['Request']],
		['Request to global 0xFF from 0x21', 0x18eaff21, 0xea00, ['Request']],
		['PDU1 PF 0xEB (transport data) is not a request', 0x1ceb00f9, 0xeb00, []],
		['data page 1 PGN 0x1FEF1', 0x19fef100, 0x1fef1, ['DataPage1']],
		['bits 29-31 (driver flags) ignored', 0x80000000 + 0x18fef100, 0xfef1, ['CCVS']],
		['PF 239 is still PDU1', 0x18effe00, 0xef00, []],
		['PF 240 is PDU2', 0x18f0fe00, 0xf0fe, []]
	];

	let built: ReturnType<typeof build> | undefined;
	const jm = () =>
		(built ??= build('jm', map, (frames) =>
			[
				'#include <stdio.h>',
				'#include <stdlib.h>',
				'#include "jm.h"',
				'int main(int argc, char **argv)',
				'{',
				'\tuint32_t id = (uint32_t)strtoul(argv[1], NULL, 0);',
				'\t(void)argc;',
				'\tprintf("%lu", (unsigned long)jm_j1939_pgn(id));',
				...frames.map((g) => `\tprintf(" %d", ${g.matches}(id));`),
				'\treturn 0;',
				'}',
				''
			].join('\n')
		));

	it.each(cases)('%s', async (_, id, pgn, matching) => {
		const { program, generated } = jm();
		const [gotPgn, ...flags] = run(await program, [String(id)])
			.toString()
			.trim()
			.split(' ');
		expect(Number(gotPgn)).toBe(pgn);
		const names = generated.frames.map((g) => g.name);
		expect(names.filter((_, i) => flags[i] === '1')).toEqual(matching);
	});
});
