import { readFileSync } from 'node:fs';

export interface FixtureRow {
	/** Seconds as written in the file. */
	time: number;
	id: number;
	bytes: Uint8Array;
	/** The payload for DataView reads, the tests' reference for byte order. */
	view: DataView;
}

/**
 * The rows of a canonical capture CSV (docs/capture-csv.md: time,id,extended,dlc,data) read by hand with string
 * splitting — independent of the app's importer, so tests can check what the app shows against it.
 */
export function readFixtureRows(path: string): FixtureRow[] {
	return readFileSync(path, 'utf8')
		.trim()
		.split('\n')
		.slice(1)
		.map((line) => {
			const [time, id, , , data] = line.split(',');
			const bytes = Uint8Array.from(data.trim().split(/\s+/), (h) => Number.parseInt(h, 16));
			return {
				time: Number(time),
				id: Number.parseInt(id, 16),
				bytes,
				view: new DataView(bytes.buffer)
			};
		});
}
