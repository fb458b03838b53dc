/** `publish --server URL --map NAME --version N --note TEXT`: the draft as the next revision. */
import { z } from 'zod';
import { parseCommand } from '../args';
import type { Command } from '../command';
import { EXIT } from '../errors';
import { printJson } from '../io';
import { connect, remoteError, serverOption } from '../remote/connection';
import { findMap, mapNameOption } from '../remote/maps';
import { explainStaleDraft } from '../remote/stale';
import { draftVersionOption } from './push';

const schema = z.object({
	server: serverOption,
	map: mapNameOption,
	version: draftVersionOption,
	note: z
		.string({ error: '--note TEXT is required: say what changed' })
		.trim()
		.min(1, '--note must say what changed'),
	positionals: z.array(z.string()).max(0, 'takes no arguments besides the options')
});

export const command: Command = {
	usage: `Usage: publish --server URL --map NAME --version N --note TEXT

Publishes the map's draft as its next revision (r1, r2, …) with the note, if the draft is still at
version N — the version you reviewed (pull --revision draft, or push, print it). The workspace's
other members are told by e-mail. Prints {"revision": {"number"}, "notified"}.
Exit 1 if the draft changed since version N (who and when are said) or has lint errors (lint
--revision draft lists them). Needs an edit token.`,

	async run(argv) {
		const options = parseCommand(
			'publish',
			argv,
			{
				server: { type: 'string' },
				map: { type: 'string' },
				version: { type: 'string' },
				note: { type: 'string' }
			},
			schema
		);
		const remote = await connect(options.server);
		const summary = await findMap(remote, options.map);
		try {
			const published = await remote.api('maps.publish', {
				params: { mapId: summary.id },
				body: { version: options.version, note: options.note }
			});
			process.stderr.write(`published r${published.revision.number} of "${summary.name}"\n`);
			printJson(published);
		} catch (error) {
			throw (
				explainStaleDraft(error, {
					mapName: summary.name,
					version: options.version,
					retry: (current) =>
						`Review version ${current} (pull --revision draft) and publish with --version ${current}.`
				}) ?? remoteError(error, remote.server)
			);
		}
		return EXIT.ok;
	}
};
