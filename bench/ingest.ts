/**
 * Ingest benchmark (`npm run bench`, or `npx tsx bench/ingest.ts --frames N`). Prints figures only;
 * nothing here asserts a timing.
 *
 * Issue 11's aims: streaming ingest of every supported layout at most 1.25× papaparse alone on the
 * same file, and ingest of a gzip-compressed file at most 1.5× the same file uncompressed.
 *
 * Workload: for each layout below, one generated file of N frames (default 500,000) of the same
 * seeded random traffic (40 standard and 8 extended IDs, DLC 0–8, 1 kHz), written in that layout.
 * Each side reads the file from disk in the same 1 MiB chunks:
 *  - papaparse: UTF-8 decode, cut at whole lines, papaparse's streaming Parser with the layout's
 *    delimiter, rows thrown away — the text work no ingest can avoid;
 *  - ingest: `ingestCaptureInto` with the layout the importer detects, into a FrameStore (what
 *    processing does, less the segment writes to storage);
 *  - gzip: the same ingest on the file compressed by Node's zlib (level 6), decompressed while
 *    streaming by `plainBytes` (src/lib/server/captures/gzip.ts), as processing reads an upload.
 * Figures are CPU seconds of this process (user + system, every thread), not wall-clock time: on a
 * shared, loaded machine wall time mostly measures waiting for a core. Runs are interleaved and each
 * figure is the best of RUNS, in this one process (every side has been run once before timing
 * starts). The load average is printed; ratios from one run compare better than absolute times.
 */
import { createReadStream, mkdtempSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import { detectCaptureLayout } from '../src/lib/can/capture/detect-layout';
import { FrameStore } from '../src/lib/can/capture/frame-store';
import { ingestCaptureInto } from '../src/lib/can/capture/ingest';
import type { CaptureLayout } from '../src/lib/can/capture/layout';
import { seededRandom } from '../src/lib/can/testing/seeded-random';
import { plainBytes } from '../src/lib/server/captures/gzip';
import { papaparseRows } from './papaparse-alone';

const argValue = (name: string) => {
	const at = process.argv.indexOf(name);
	return at >= 0 ? process.argv[at + 1] : undefined;
};
const FRAMES = Number(argValue('--frames') ?? 500_000);
const RUNS = Number(argValue('--runs') ?? 5);
const ONLY = argValue('--layout');
const CHUNK_BYTES = 1 << 20;
const SEED = 0x11e57;

interface Frame {
	time: number;
	id: number;
	extended: boolean;
	data: number[];
}

function traffic(): Frame[] {
	const { next: random } = seededRandom(SEED);
	const ids = [
		...Array.from({ length: 40 }, (_, k) => ({ id: 0x100 + 7 * k, extended: false })),
		...Array.from({ length: 8 }, (_, k) => ({ id: 0x18fe0000 + (k << 8) + 0x21, extended: true }))
	];
	return Array.from({ length: FRAMES }, (_, i) => {
		const { id, extended } = ids[Math.floor(random() * ids.length)];
		const dlc = random() < 0.1 ? Math.floor(random() * 8) : 8;
		return {
			time: i / 1000 + random() * 1e-4,
			id,
			extended,
			data: Array.from({ length: dlc }, () => Math.floor(random() * 256))
		};
	});
}

const hex = (n: number, width = 2) => n.toString(16).toUpperCase().padStart(width, '0');
const idHex = (f: Frame) => hex(f.id, f.extended ? 8 : 3);
const spaced = (f: Frame) => f.data.map((b) => hex(b)).join(' ');
const sec = (t: number) => t.toFixed(6);
/** hh:mm:ss.ffffff from 10:15:00 on. */
const timeOfDay = (t: number) => {
	const s = 10 * 3600 + 15 * 60 + t;
	const hh = Math.floor(s / 3600);
	const mm = Math.floor((s % 3600) / 60);
	const ss = s % 60;
	return `${String(hh).padStart(2, '0')}:${String(mm).padStart(2, '0')}:${ss.toFixed(6).padStart(9, '0')}`;
};
/** ISO 8601 with microseconds, from 2026-03-01T10:15:00Z on (invented). */
const dateTime = (t: number) => `2026-03-01T${timeOfDay(t)}Z`;

interface LayoutCase {
	name: string;
	header: string | null;
	row: (f: Frame, i: number) => string;
}

const CASES: LayoutCase[] = [
	{
		name: 'canonical',
		header: 'time,id,extended,dlc,data',
		row: (f) => `${sec(f.time)},${idHex(f)},${f.extended ? 1 : 0},${f.data.length},${spaced(f)}`
	},
	{
		name: 'ragged, no header, flag column',
		header: null,
		row: (f) =>
			[
				sec(f.time),
				idHex(f),
				f.data.length,
				...f.data.map((b) => hex(b)),
				f.extended ? 'X' : 'S'
			].join(',')
	},
	{
		name: 'semicolon, h-suffix IDs, spaced bytes',
		header: 'Time;ID;DLC;Data',
		row: (f) => `${sec(f.time)};${idHex(f)}h;${f.data.length};${spaced(f)}`
	},
	{
		name: 'time of day',
		header: 'time,id,dlc,data',
		row: (f) => `${timeOfDay(f.time)},${idHex(f)},${f.data.length},${spaced(f)}`
	},
	{
		name: 'ISO 8601 date-time',
		header: 'timestamp,id,dlc,data',
		row: (f) => `${dateTime(f.time)},${idHex(f)},${f.data.length},${spaced(f)}`
	},
	{
		name: 'bus and direction columns',
		header: 'time,bus,dir,id,dlc,data',
		row: (f, i) =>
			`${sec(f.time)},can${i % 3},${i % 5 === 0 ? 'Tx' : 'Rx'},${idHex(f)},${f.data.length},${spaced(f)}`
	},
	{
		name: 'ms times, 0x IDs, byte columns',
		header: 'time_ms,id,dlc,b0,b1,b2,b3,b4,b5,b6,b7',
		row: (f) =>
			[
				(f.time * 1e3).toFixed(3),
				`0x${idHex(f)}`,
				f.data.length,
				...Array.from({ length: 8 }, (_, k) => (k < f.data.length ? hex(f.data[k]) : ''))
			].join(',')
	}
];

/**
 * Writes the layout's file and its gzip copy; returns the first 64 KiB of text for detection. The
 * frames and the text are dropped on return, so no large heap stays alive while timing (a big live
 * heap makes every major collection of the ingest slower than it is in the server).
 */
function writeCase(c: LayoutCase, path: string, gzPath: string): string {
	const text =
		(c.header ? `${c.header}\n` : '') +
		traffic()
			.map((f, i) => c.row(f, i))
			.join('\n') +
		'\n';
	writeFileSync(path, text);
	writeFileSync(gzPath, gzipSync(Buffer.from(text)));
	return text.slice(0, 1 << 16);
}

const fileChunks = (path: string) => createReadStream(path, { highWaterMark: CHUNK_BYTES });

/** Seconds of CPU this process used (every thread: zlib inflates on libuv's pool) while `run` ran. */
async function cpuSeconds(run: () => Promise<void>): Promise<number> {
	const start = process.cpuUsage();
	await run();
	const used = process.cpuUsage(start);
	return (used.user + used.system) / 1e6;
}

async function papaparseAlone(path: string, delimiter: string): Promise<void> {
	const rows = await papaparseRows(fileChunks(path), delimiter);
	if (rows < FRAMES) throw new Error(`bench: papaparse read ${rows} rows`);
}

async function ingest(path: string, layout: CaptureLayout, gzip: boolean): Promise<void> {
	const source = gzip ? plainBytes(fileChunks(path)) : fileChunks(path);
	const report = await ingestCaptureInto(source, new FrameStore(), { layout });
	if (report.frameCount !== FRAMES || report.badRowCount > 0)
		throw new Error(
			`bench: ${path} read ${report.frameCount} frames, ${report.badRowCount} bad rows (${report.badRows[0]?.reason})`
		);
}

const pad = (s: string, n: number) => s.padEnd(n);
const f3 = (s: number) => `${s.toFixed(3)} s`;
const x = (a: number, b: number) => `${(a / b).toFixed(2)}×`;

async function main() {
	const dir = mkdtempSync(join(tmpdir(), 'fw-ingest-bench-'));
	const load = () =>
		loadavg()
			.map((l) => l.toFixed(2))
			.join(' ');
	console.log(
		`Framewright ingest benchmark: ${FRAMES.toLocaleString('en')} frames per layout, CPU seconds, best of ${RUNS}; load average ${load()}`
	);
	console.log(
		`${pad('layout', 40)}${pad('MB', 7)}${pad('papaparse', 11)}${pad('ingest', 10)}${pad('÷ papa', 8)}${pad('gzip MB', 9)}${pad('gzip ingest', 13)}÷ plain`
	);
	const misses: string[] = [];
	try {
		for (const c of CASES) {
			if (ONLY && !c.name.includes(ONLY)) continue;
			const path = join(dir, 'capture.csv');
			const gzPath = join(dir, 'capture.csv.gz');
			const head = writeCase(c, path, gzPath);
			const guess = detectCaptureLayout(head);
			if (guess.problem) throw new Error(`bench: ${c.name}: ${guess.problem}`);
			const { layout } = guess;
			const sides = [
				() => papaparseAlone(path, layout.delimiter),
				() => ingest(path, layout, false),
				() => ingest(gzPath, layout, true)
			];
			for (const side of sides) await side(); // warm-up
			const best = [Infinity, Infinity, Infinity];
			for (let r = 0; r < RUNS; r++)
				for (let s = 0; s < sides.length; s++)
					best[s] = Math.min(best[s], await cpuSeconds(sides[s]));
			const [papa, plain, gz] = best;
			console.log(
				`${pad(c.name, 40)}${pad((statSync(path).size / 1e6).toFixed(1), 7)}${pad(f3(papa), 11)}${pad(f3(plain), 10)}${pad(x(plain, papa), 8)}${pad((statSync(gzPath).size / 1e6).toFixed(1), 9)}${pad(f3(gz), 13)}${x(gz, plain)}`
			);
			if (plain / papa > 1.25) misses.push(`${c.name}: ingest ${x(plain, papa)} papaparse`);
			if (gz / plain > 1.5) misses.push(`${c.name}: gzip ${x(gz, plain)} plain`);
		}
	} finally {
		rmSync(dir, { recursive: true, force: true });
	}
	console.log(`load average after: ${load()}`);
	console.log(
		misses.length === 0
			? 'Aims met: every layout ≤ 1.25× papaparse alone, gzip ≤ 1.5× plain.'
			: `Aims missed (machine load skews single runs): ${misses.join('; ')}`
	);
}

await main();
