// The reference for capture journeys: the demo fixture read by hand, independently of the app's
// importer and decoder, with DataView as the reference reader of byte order.
import { readFileSync } from 'node:fs';
import type { Locator } from '@playwright/test';
import { readFixtureRows } from './fixture-rows';

export const capturePath = 'fixtures/club-racer-session.csv';

export interface FixtureSignal {
	name: string;
	startBit: number;
	length: number;
	byteOrder: 'little' | 'big';
	valueType?: string;
	scale: number;
	offset: number;
	multiplexer?: boolean;
	muxValue?: number | null;
	max?: number | null;
}
export interface FixtureFrame {
	name: string;
	id: string;
	signals: FixtureSignal[];
}
export const map = JSON.parse(readFileSync('fixtures/club-racer-ecu.map.json', 'utf8')) as {
	name: string;
	frames: FixtureFrame[];
};

/** Rows of the canonical capture CSV (docs/capture-csv.md: time,id,extended,dlc,data) as (id, payload bytes). */
export const rows = readFixtureRows(capturePath);

/**
 * A byte-aligned unsigned signal read with DataView (the reference implementation of byte order):
 * little-endian starts at byte startBit/8; a big-endian field's startBit is its least significant
 * bit, in its last byte (docs/bit-numbering.md), so it starts length/8 − 1 bytes earlier.
 */
export function readByteAligned(view: DataView, s: FixtureSignal): number {
	if (
		s.startBit % 8 !== 0 ||
		![8, 16].includes(s.length) ||
		(s.valueType ?? 'unsigned') !== 'unsigned'
	) {
		throw new Error(
			`${s.name} is not a byte-aligned unsigned 8/16-bit signal; the reference reads only those`
		);
	}
	const bytes = s.length / 8;
	const first = s.byteOrder === 'little' ? s.startBit / 8 : s.startBit / 8 - (bytes - 1);
	const raw = bytes === 1 ? view.getUint8(first) : view.getUint16(first, s.byteOrder === 'little');
	return raw * s.scale + s.offset;
}

export function frameOf(name: string): FixtureFrame {
	const frame = map.frames.find((f) => f.name === name);
	if (!frame) throw new Error(`no frame ${name} in the fixture map`);
	return frame;
}

export function referenceRange(frameName: string, signalName: string) {
	const frame = frameOf(frameName);
	const signal = frame.signals.find((s) => s.name === signalName)!;
	const values = rows
		.filter((r) => r.id === Number(frame.id))
		.map((r) => readByteAligned(r.view, signal));
	return { min: Math.min(...values), max: Math.max(...values), count: values.length };
}

/** Min and max cells of a channel row in the Channels tables. */
export async function shownRange(row: Locator) {
	const cells = row.getByRole('cell');
	// Columns after the signal name in the Channels panel: unit, min, max, mean, last, out of range.
	return {
		min: Number(await cells.nth(1).innerText()),
		max: Number(await cells.nth(2).innerText())
	};
}
