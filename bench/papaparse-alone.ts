/**
 * papaparse alone on a stream of file chunks — UTF-8 decode, cut at whole lines, papaparse's
 * streaming Parser, rows thrown away: the text work no ingest can avoid, the baseline the ingest
 * benchmarks (run.ts, ingest.ts) compare with. Returns the row count.
 */
import Papa from 'papaparse';

export async function papaparseRows(
	chunks: AsyncIterable<Uint8Array | string>,
	delimiter: string
): Promise<number> {
	const parser = new Papa.Parser({ delimiter, newline: '\n' });
	const decoder = new TextDecoder('utf-8');
	let rows = 0;
	let pending = '';
	for await (const chunk of chunks) {
		pending += decoder.decode(chunk as Uint8Array, { stream: true });
		const cut = pending.lastIndexOf('\n');
		if (cut < 0) continue;
		rows += parser.parse(pending.slice(0, cut + 1), 0, true).data.length;
		pending = pending.slice(cut + 1);
	}
	pending += decoder.decode();
	if (pending) rows += parser.parse(pending, 0, false).data.length;
	return rows;
}
