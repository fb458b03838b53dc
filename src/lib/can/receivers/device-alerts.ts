/**
 * A profile's channels as its device sees them (decoded channels put through each link's
 * conversion) and the device's own alert rules replayed over them with the map alert engine.
 */
import type { ReplayChannel } from '../alerts/replay';
import { replayAlertRules, type AlertReplay } from '../alerts/replay';
import type { AlertRule } from '../alerts/rule';
import { applyConversion } from './conversion';
import type { Link } from './linking';
import type { ReceiverProfile } from './profile';

/** A decoded channel of a capture, as the capture decoder and the alert replay give it. */
export type CaptureChannel = ReplayChannel;

/** The decoded channel a link reads, by frame and signal name. */
export function channelOf(
	channels: readonly CaptureChannel[],
	link: Pick<Link, 'frame' | 'signal'>
): CaptureChannel | undefined {
	return channels.find((c) => c.info.frameName === link.frame && c.info.signalName === link.signal);
}

/**
 * One channel per linked wanted channel, in the device's unit. Its `info.frameName` is the
 * profile's name and `info.signalName` the wanted channel's, so rules on wanted channels find it.
 * `info.index` is the wanted channel's position in the profile.
 */
export function deviceChannels(
	profile: ReceiverProfile,
	links: readonly Link[],
	channels: readonly CaptureChannel[]
): CaptureChannel[] {
	return profile.wanted.flatMap((wanted, index) => {
		const link = links.find((l) => l.wanted.toLowerCase() === wanted.name.toLowerCase());
		const source = link && channelOf(channels, link);
		if (!link || !source) return [];
		const value = source.value.map((v) => applyConversion(link.conversion, v));
		return [
			{
				info: { index, frameName: profile.name, signalName: wanted.name, unit: wanted.unit },
				time: source.time,
				value
			}
		];
	});
}

/** The device alert rules as alert-engine rules on the device channels above. */
export function deviceAlertRules(profile: ReceiverProfile): AlertRule[] {
	return profile.alertRules.map((rule) => {
		const wanted = profile.wanted.find((w) => w.name.toLowerCase() === rule.channel.toLowerCase());
		return { ...rule, channel: { frame: profile.name, signal: wanted?.name ?? rule.channel } };
	});
}

/** Replays the device's alert rules over a capture, in the units the device shows. */
export function replayDeviceAlerts(
	profile: ReceiverProfile,
	links: readonly Link[],
	channels: readonly CaptureChannel[],
	endTime: number,
	acknowledgements: readonly { ruleId: string; time: number }[] = []
): AlertReplay {
	return replayAlertRules(
		{ alertRules: deviceAlertRules(profile) },
		deviceChannels(profile, links, channels),
		endTime,
		acknowledgements
	);
}
