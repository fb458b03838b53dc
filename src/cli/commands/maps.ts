/** `maps --server URL`: the maps of the access token's workspace. */
import { z } from 'zod';
import { parseCommand } from '../args';
import type { Command } from '../command';
import { EXIT } from '../errors';
import { printJson } from '../io';
import { connect, remoteError, serverOption } from '../remote/connection';

const schema = z.object({
	server: serverOption,
	positionals: z.array(z.string()).max(0, 'takes no arguments')
});

export const command: Command = {
	usage: `Usage: maps --server URL

Lists the maps of the access token's workspace (token from FRAMEWRIGHT_TOKEN) as JSON:
  {"workspace": {"id", "slug", "name", "role"},
   "maps": [{"id", "name", "latestRevision", "frameCount", "updatedAt", "updatedBy"}]}
latestRevision is null for a map never published. See docs/cli.md, "Remote use".`,

	async run(argv) {
		const options = parseCommand('maps', argv, { server: { type: 'string' } }, schema);
		const remote = await connect(options.server);
		try {
			const { maps } = await remote.api('maps.list');
			printJson({ workspace: remote.workspace, maps });
		} catch (error) {
			throw remoteError(error, remote.server);
		}
		return EXIT.ok;
	}
};
