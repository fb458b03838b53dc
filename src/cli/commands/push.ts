/** `push --server URL --map NAME --version N DRAFT.json`: replaces a map's draft, if unchanged since N. */
import { z } from 'zod';
import { parseCommand } from '../args';
import type { Command } from '../command';
import { EXIT } from '../errors';
import { printJson, readMapFile } from '../io';
import { connect, remoteError, serverOption } from '../remote/connection';
import { findMap, mapNameOption } from '../remote/maps';
import { explainStaleDraft } from '../remote/stale';

export const draftVersionOption = z
	.string({
		error: '--version N is required: the draft version you pulled (pull --revision draft)'
	})
	.regex(/^[1-9]\d{0,8}$/, 'must be a draft version number, like 7')
	.transform(Number);

const schema = z.object({
	server: serverOption,
	map: mapNameOption,
	version: draftVersionOption,
	positionals: z.array(z.string()).min(1, 'DRAFT.json is required').max(1, 'give one map file')
});

export const command: Command = {
	usage: `Usage: push --server URL --map NAME --version N DRAFT.json

Replaces the map's draft with DRAFT.json (framewright-map@1, checked here first), but only if the
draft is still at version N — the version you pulled (pull --revision draft prints it). If someone
saved the draft since, nothing changes and the command exits 1 saying who saved it and when.
Prints {"version", "lint"}: the draft's new version and its lint problems. A draft may hold lint
errors (they are counted on stderr); publishing refuses them. Needs an edit token.`,

	async run(argv) {
		const options = parseCommand(
			'push',
			argv,
			{ server: { type: 'string' }, map: { type: 'string' }, version: { type: 'string' } },
			schema
		);
		const draft = await readMapFile(options.positionals[0]);
		const remote = await connect(options.server);
		const summary = await findMap(remote, options.map);
		try {
			const saved = await remote.api('maps.saveDraft', {
				params: { mapId: summary.id },
				body: { version: options.version, draft }
			});
			const errors = saved.lint.filter((p) => p.severity === 'error').length;
			if (errors)
				process.stderr.write(
					`note: the draft has ${errors} lint error${errors === 1 ? '' : 's'}; it cannot be published until they are fixed\n`
				);
			printJson(saved);
		} catch (error) {
			throw (
				explainStaleDraft(error, {
					mapName: summary.name,
					version: options.version,
					retry: (current) =>
						`Pull the draft again (pull --revision draft), redo your change and push with --version ${current}.`
				}) ?? remoteError(error, remote.server)
			);
		}
		return EXIT.ok;
	}
};
