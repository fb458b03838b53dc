/** `pull --server URL --map NAME [--revision N|latest|draft] [--out FILE]`: a map from the server. */
import { z } from 'zod';
import { serializeMap } from '../../lib/can/map-json';
import { parseCommand } from '../args';
import type { Command } from '../command';
import { EXIT } from '../errors';
import { printJson, writeWhole } from '../io';
import { connect, remoteError, serverOption } from '../remote/connection';
import {
	concreteRevision,
	findMap,
	mapNameOption,
	revisionLabelOf,
	revisionOption
} from '../remote/maps';

const schema = z.object({
	server: serverOption,
	map: mapNameOption,
	revision: revisionOption.default('latest'),
	out: z.string().min(1, '--out needs a file name').optional(),
	positionals: z.array(z.string()).max(0, 'takes no arguments besides the options')
});

export const command: Command = {
	usage: `Usage: pull --server URL --map NAME [--revision N|latest|draft] [--out FILE]

Fetches a map as of a published revision (default: the latest) or its draft, in the
framewright-map@1 format (docs/map-format.md). --map is the map's name (any case) or id.
Without --out the map JSON goes to stdout; with --out it is written to FILE and a summary is printed:
  {"file", "map": {"id", "name"}, "revision": "r3" | "draft", "version"}
version is the draft's version (push and publish name it) for --revision draft, else null; it is
also printed on stderr ("draft version 7").`,

	async run(argv) {
		const options = parseCommand(
			'pull',
			argv,
			{
				server: { type: 'string' },
				map: { type: 'string' },
				revision: { type: 'string' },
				out: { type: 'string' }
			},
			schema
		);
		const remote = await connect(options.server);
		const summary = await findMap(remote, options.map);
		const ref = concreteRevision(summary, options.revision);
		let text: string;
		let version: number | null = null;
		try {
			if (ref === 'draft') {
				const view = await remote.api('maps.get', { params: { mapId: summary.id } });
				text = serializeMap(view.map.draft);
				version = view.map.version;
				process.stderr.write(`draft version ${version}\n`);
			} else {
				const view = await remote.api('maps.revision', { params: { mapId: summary.id, n: ref } });
				text = serializeMap(view.revision.map);
			}
		} catch (error) {
			throw remoteError(error, remote.server);
		}
		if (options.out === undefined) {
			process.stdout.write(text);
		} else {
			await writeWhole(options.out, text);
			printJson({
				file: options.out,
				map: { id: summary.id, name: summary.name },
				revision: revisionLabelOf(ref),
				version
			});
		}
		return EXIT.ok;
	}
};
