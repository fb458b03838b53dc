/**
 * Alert rules replayed over a decode, in a capture worker: only the channels the rules name are
 * decoded (whole, from their identifiers' chunks), so memory grows with those channels alone.
 */
import { replayAlertRules } from '../../../can/alerts/replay';
import { channelSamples } from '../../../can/capture/chunked-decode';
import type { BlobStorage } from '../../storage/storage';
import { openChunkSource } from '../capture-store';
import { compiledFor } from './series';
import type { AlertsOutcome, AlertsTask, SamplesTask } from './tasks';

export async function runAlerts(storage: BlobStorage, task: AlertsTask): Promise<AlertsOutcome> {
	const compiled = await compiledFor(task.folder, task.map);
	const source = await openChunkSource(storage, task.indexKey, { cache: false });
	const named = new Set(
		task.map.alertRules.map((r) => `${r.channel.frame}\u0000${r.channel.signal}`)
	);
	const channels = [];
	for (const info of compiled.channels) {
		if (!named.has(`${info.frameName}\u0000${info.signalName}`)) continue;
		channels.push({ info, ...(await channelSamples(source, compiled, info.index)) });
	}
	return replayAlertRules(task.map, channels, task.duration, task.acknowledgements);
}

/** One channel's every sample (tests, small captures). */
export async function runSamples(
	storage: BlobStorage,
	task: SamplesTask
): Promise<{ time: Float64Array; value: Float64Array }> {
	const compiled = await compiledFor(task.folder, task.map);
	return channelSamples(await openChunkSource(storage, task.indexKey), compiled, task.channel);
}
