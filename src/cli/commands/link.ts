/** `link --map MAP.json --profile PROFILE.json`: link a receiver profile to a map, as a JSON report. */
import { z } from 'zod';
import { formatCanId } from '../../lib/can/map-json';
import { composeScaling, describeConversion } from '../../lib/can/receivers/conversion';
import {
	findMapSignal,
	linkProfile,
	missingRequired,
	type Candidate,
	type LinkReport
} from '../../lib/can/receivers/linking';
import type { CanMap } from '../../lib/can/map';
import { mapPath, parseCommand, profilePath } from '../args';
import type { Command } from '../command';
import { EXIT, InputError } from '../errors';
import { printJson, readMapFile } from '../io';
import { readProfileFile, readSynonymsFile } from '../profile-io';

export const linkOptionsSchema = z.object({
	map: mapPath,
	profile: profilePath,
	synonyms: z.string().min(1, '--synonyms needs a file name').optional(),
	positionals: z.array(z.string()).max(0, 'takes no file arguments besides --map and --profile')
});

export const LINK_OPTIONS = {
	map: { type: 'string' },
	profile: { type: 'string' },
	synonyms: { type: 'string' }
} as const;

/** Reads the files and links; a hand-made link that cannot be made is an input error. */
export async function linkFromFiles(options: z.output<typeof linkOptionsSchema>) {
	const [map, profile, synonyms] = await Promise.all([
		readMapFile(options.map),
		readProfileFile(options.profile),
		options.synonyms ? readSynonymsFile(options.synonyms) : undefined
	]);
	const report = linkProfile(profile, map, { synonyms });
	if (report.problems.length) {
		const [first] = report.problems;
		const more = report.problems.length > 1 ? ` (and ${report.problems.length - 1} more)` : '';
		throw new InputError(`${options.profile}: ${first.path}: ${first.message}${more}`);
	}
	return { map, profile, report };
}

/** The report with hex IDs and, for each link, the scaling a device ends up with. */
function reportDocument(report: LinkReport, map: CanMap) {
	const candidate = (c: Candidate) => ({
		frame: c.frame,
		id: formatCanId(c.id, c.extended),
		signal: c.signal,
		score: c.score,
		reason: c.reason,
		problem: c.problem
	});
	return {
		profile: report.profile,
		map: report.map,
		links: report.links.map(({ link, reason, required, candidates }) => {
			const signal = findMapSignal(map, link)!.signal;
			return {
				wanted: link.wanted,
				required,
				frame: link.frame,
				id: formatCanId(link.id, link.extended),
				extended: link.extended,
				signal: link.signal,
				score: link.confidence,
				manual: link.manual,
				reason,
				conversion: { ...link.conversion, text: describeConversion(link.conversion) },
				composed: composeScaling(signal, link.conversion),
				alternatives: candidates
					.filter((c) => c.frame !== link.frame || c.signal !== link.signal)
					.slice(0, 3)
					.map(candidate)
			};
		}),
		unlinked: report.unlinked.map((u) => ({
			wanted: u.wanted,
			required: u.required,
			reason: u.reason,
			candidates: u.candidates.map(candidate)
		}))
	};
}

export const command: Command = {
	usage: `Usage: link --map MAP.json --profile PROFILE.json [--synonyms SYNONYMS.json]

Links each wanted channel of a receiver profile (framewright-profile@1) to a signal of the map:
links fixed by hand in the profile first, then automatically by name, synonyms and unit.
Prints JSON {"profile", "map", "links": [...], "unlinked": [...]}; each link has its score, the
reason, the unit conversion and the composed scale/offset, each unlinked channel its best
candidates. --synonyms adds abbreviations and synonym groups (the shape of synonyms.json).
Exit 1 when a required channel stays unlinked or a link made by hand cannot be made.`,

	async run(argv) {
		const options = parseCommand('link', argv, LINK_OPTIONS, linkOptionsSchema);
		const { map, report } = await linkFromFiles(options);
		printJson(reportDocument(report, map));
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
