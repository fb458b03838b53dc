/**
 * Field proposals and correlation in a capture worker (docs/field-proposals.md). Only the chunks
 * of the IDs asked about are read (idFramesFromChunks), so memory grows with those IDs' frames, not
 * with the capture; the channel of a correlation is decoded from its own identifier's chunks.
 */
import { channelSamples } from '../../../can/capture/chunked-decode';
import { correlateFields, idFramesFromChunks, proposeFields } from '../../../can/fields';
import type { BlobStorage } from '../../storage/storage';
import { openChunkSource } from '../capture-store';
import { compiledFor } from './series';
import type { CorrelateOutcome, CorrelateTask, FieldsOutcome, FieldsTask } from './tasks';

const keyOf = (id: number, extended: boolean) => `${extended ? 'x' : 's'}${id}`;

export async function runFields(storage: BlobStorage, task: FieldsTask): Promise<FieldsOutcome> {
	const wanted = new Set(task.ids.map((i) => keyOf(i.id, i.extended)));
	const source = await openChunkSource(storage, task.indexKey, { cache: false });
	const out: FieldsOutcome = [];
	// One ID's frames in memory at a time.
	for (let k = 0; k < source.index.keyId.length; k++) {
		const id = source.index.keyId[k];
		const extended = source.index.keyExtended[k] === 1;
		if (!wanted.has(keyOf(id, extended))) continue;
		const [frames] = await idFramesFromChunks(source, (i, x) => i === id && x === extended);
		out.push(proposeFields(frames));
	}
	return out.sort((a, b) => Number(a.extended) - Number(b.extended) || a.id - b.id);
}

export async function runCorrelate(
	storage: BlobStorage,
	task: CorrelateTask
): Promise<CorrelateOutcome> {
	const compiled = await compiledFor(task.folder, task.map);
	const source = await openChunkSource(storage, task.indexKey, { cache: false });
	const channel = await channelSamples(source, compiled, task.channel);
	const wanted = new Set(task.candidates.map((c) => keyOf(c.id, c.extended)));
	const frames = await idFramesFromChunks(source, (id, x) => wanted.has(keyOf(id, x)));
	const byKey = new Map(frames.map((f) => [keyOf(f.id, f.extended), f]));
	const candidates = task.candidates.flatMap((field) => {
		const f = byKey.get(keyOf(field.id, field.extended));
		return f ? [{ field, frames: f }] : [];
	});
	const ranked = correlateFields(channel, candidates, { maxPoints: task.maxPoints });
	const best = ranked[0]?.pearson != null ? ranked[0] : null;
	return {
		ranking: ranked.slice(0, task.top).map(({ scatter: _, ...row }) => row),
		scatter: best
			? { raw: Array.from(best.scatter.raw), channel: Array.from(best.scatter.channel) }
			: { raw: [], channel: [] }
	};
}
