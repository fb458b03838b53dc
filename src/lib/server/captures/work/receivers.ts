/**
 * A receiver profile on a decode, in a capture worker: only the channels its links read are decoded
 * (whole, from their identifiers' chunks), then the installer's checklist or the device's alert
 * rules run over them (src/lib/can/receivers/).
 */
import { channelSamples } from '../../../can/capture/chunked-decode';
import { checkOnCapture } from '../../../can/receivers/check';
import { replayDeviceAlerts } from '../../../can/receivers/device-alerts';
import type { BlobStorage } from '../../storage/storage';
import { openChunkSource } from '../capture-store';
import { compiledFor } from './series';
import type { ReceiverOutcome, ReceiverTask } from './tasks';

export async function runReceiver(
	storage: BlobStorage,
	task: ReceiverTask
): Promise<ReceiverOutcome> {
	const compiled = await compiledFor(task.folder, task.map);
	const source = await openChunkSource(storage, task.indexKey, { cache: false });
	const linked = new Set(task.links.map((l) => `${l.frame}\u0000${l.signal}`));
	const channels = [];
	for (const info of compiled.channels) {
		if (!linked.has(`${info.frameName}\u0000${info.signalName}`)) continue;
		channels.push({ info, ...(await channelSamples(source, compiled, info.index)) });
	}
	return task.what === 'check'
		? checkOnCapture(task.profile, task.map, task.links, channels)
		: replayDeviceAlerts(task.profile, task.links, channels, task.duration, task.acknowledgements);
}
