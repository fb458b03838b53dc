/** `receive-set --map MAP.json --profile PROFILE.json`: the receive set of a linked profile. */
import { buildReceiveSet, serializeReceiveSet } from '../../lib/can/receivers/receive-set';
import { missingRequired } from '../../lib/can/receivers/linking';
import { parseCommand } from '../args';
import type { Command } from '../command';
import { EXIT, InputError } from '../errors';
import { LINK_OPTIONS, linkFromFiles, linkOptionsSchema } from './link';

export const command: Command = {
	usage: `Usage: receive-set --map MAP.json --profile PROFILE.json [--synonyms SYNONYMS.json]

Links the profile to the map as "link" does and prints the receive set (framewright-receive@1):
per linked wanted channel the frame ID, standard/extended, start bit, length, byte order, value
type and the scale/offset already composed with the unit conversion, plus the bus bit rate.
Exit 1 (the set is still printed) when a required channel stays unlinked.`,

	async run(argv) {
		const options = parseCommand('receive-set', argv, LINK_OPTIONS, linkOptionsSchema);
		const { map, profile, report } = await linkFromFiles(options);
		const built = buildReceiveSet(
			profile,
			map,
			report.links.map((l) => l.link)
		);
		// Links made just now from this very map always resolve; a failure here is a bug, said plainly.
		if (!built.ok) throw new InputError(built.problems.map((p) => p.message).join('; '));
		process.stdout.write(serializeReceiveSet(built.receiveSet));
		const missing = missingRequired(report);
		if (missing.length) {
			process.stderr.write(
				`error: required channel${missing.length > 1 ? 's' : ''} left unlinked: ${missing.map((m) => m.wanted).join(', ')}\n`
			);
			return EXIT.failure;
		}
		return EXIT.ok;
	}
};
