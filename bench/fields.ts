/**
 * Field-proposal benchmark (`npm run bench`, or `npx tsx bench/fields.ts`). Prints figures only;
 * nothing here asserts a timing.
 *
 * Workload (issue 14): a capture of 1,000,000 frames over 40 standard IDs (25,000 frames each,
 * 8-byte payloads, the IDs interleaved in time order as on a bus), held in a FrameStore as the
 * capture worker holds it. The IDs cycle through five kinds of content, each with its own seed:
 *  A. a 4-bit counter, a CRC-8/AUTOSAR with data ID, a little-endian and a big-endian value, noise;
 *  B. a 3-page multiplexor with per-page values and constants, a counter, a sum checksum;
 *  C. pure noise;
 *  D. mostly constant bytes with a slow value and an 8-bit counter;
 *  E. four byte-aligned values and an XOR checksum.
 * Timed, in one thread: grouping the store by ID (framesById), proposals for every ID
 * (proposeFields), the two together (proposeCaptureFields, best of 3), and the correlation of one
 * known channel with every value proposal found (correlateFields).
 */
import { FrameStore } from '../src/lib/can/capture/frame-store';
import {
	candidatesFromProposals,
	correlateFields,
	framesById,
	proposeCaptureFields,
	proposeFields,
	type IdProposals
} from '../src/lib/can/fields';
import { buildCapture, FRAMES_PER_ID, IDS, TEMPLATES } from './field-capture';

const seconds = (from: number) => (performance.now() - from) / 1000;
const f3 = (s: number) => `${s.toFixed(3)} s`;

function main() {
	let t = performance.now();
	const store = buildCapture(new FrameStore());
	console.log(
		`Field proposals: ${store.count.toLocaleString('en')} frames, ${IDS} IDs, 8-byte payloads (capture built in ${f3(seconds(t))}, not timed below)`
	);

	t = performance.now();
	const groups = framesById(store);
	const groupSeconds = seconds(t);
	t = performance.now();
	const results: IdProposals[] = groups.map(proposeFields);
	const proposeSeconds = seconds(t);
	console.log(`  group by ID (framesById): ${f3(groupSeconds)}`);
	console.log(
		`  proposals for every ID (proposeFields), first run: ${f3(proposeSeconds)} — ${f3(proposeSeconds / IDS)} per ID of ${FRAMES_PER_ID.toLocaleString('en')} frames`
	);
	const runs: number[] = [];
	for (let r = 0; r < 3; r++) {
		t = performance.now();
		proposeCaptureFields(store);
		runs.push(seconds(t));
	}
	const best = Math.min(...runs);
	console.log(
		`  whole capture (proposeCaptureFields = group + propose), best of 3: ${f3(best)} (${Math.round(store.count / best).toLocaleString('en')} frames/s; runs ${runs.map(f3).join(', ')})`
	);

	const kinds = new Map<string, number>();
	for (const r of results)
		for (const f of r.fields) kinds.set(f.kind, (kinds.get(f.kind) ?? 0) + 1);
	console.log(
		`  proposals: ${[...kinds].map(([k, n]) => `${n} ${k}`).join(', ')} (template C is pure noise: ${results
			.filter((_, k) => k % TEMPLATES.length === 2)
			.reduce((n, r) => n + r.fields.length, 0)} proposals on its ${IDS / TEMPLATES.length} IDs)`
	);

	// A known channel: ID 0x100's little-endian value (bits 8–23) read as physical = raw × 0.5 + 10,
	// sampled at its own frame times; every value proposal of the capture is a candidate.
	const source = groups[0];
	const channel = {
		time: source.time,
		value: Float64Array.from(
			{ length: source.count },
			(_, i) => (source.data[i * 8 + 1] + 256 * source.data[i * 8 + 2]) * 0.5 + 10
		)
	};
	const candidates = results.flatMap((r, k) =>
		candidatesFromProposals(r, r.fields).map((field) => ({ field, frames: groups[k] }))
	);
	t = performance.now();
	const ranked = correlateFields(channel, candidates);
	const correlateSeconds = seconds(t);
	const top = ranked[0];
	console.log(
		`  correlation of one channel with ${candidates.length} candidate fields: ${f3(correlateSeconds)}; best 0x${top.field.id.toString(16)} bits ${top.field.startBit}/${top.field.length} r = ${top.pearson?.toFixed(6)}, scale ${top.scale?.toPrecision(6)}, offset ${top.offset?.toPrecision(6)}`
	);
	console.log(`  peak resident memory: ${Math.round(process.resourceUsage().maxRSS / 1024)} MB`);
}

main();
