/**
 * Channel names as the trade writes them ("ECT", "CoolantTemp", "coolant_temp_degC") brought to
 * comparable words, and how alike two names are. The abbreviations, unit words and synonym groups
 * ("concepts") are data: synonyms.json, which a workspace extends with entries of its own.
 */
import { z } from 'zod';
import { quantitySchema, type Quantity } from './quantities';
import builtIn from './synonyms.json';

const word = z
	.string()
	.trim()
	.min(1, 'an empty word')
	.max(80, 'a word or name must be at most 80 characters');

export const conceptSchema = z.strictObject({
	id: z
		.string()
		.trim()
		.regex(/^[a-z0-9][a-z0-9-]*$/, 'a concept id is lower-case words joined by "-"'),
	quantity: quantitySchema
		.optional()
		.describe('what the concept measures; tells the quantity of a signal without a unit'),
	family: z
		.string()
		.trim()
		.min(1)
		.optional()
		.describe('concepts of one family are related (λ, AFR, φ), not the same'),
	names: z.array(word).min(1, 'a concept needs at least one name')
});
export type Concept = z.output<typeof conceptSchema>;

/** The synonym data: built in (synonyms.json) or a workspace's additions, which merge into it. */
export const synonymTableSchema = z.strictObject({
	abbreviations: z
		.record(word, word)
		.default({})
		.describe('a word as written → the word(s) it stands for'),
	unitWords: z.array(word).default([]).describe('words dropped from names when others remain'),
	concepts: z.array(conceptSchema).default([])
});
export type SynonymTable = z.output<typeof synonymTableSchema>;
export type SynonymTableInput = z.input<typeof synonymTableSchema>;

/** A name made comparable. */
export interface NameInfo {
	name: string;
	/** Lower-case words with unit words dropped, before abbreviations are expanded. */
	raw: string[];
	/** Words after expanding abbreviations and plurals; a set, in first-seen order. */
	words: string[];
	/** The synonym group the whole name belongs to, if any. */
	concept: Concept | null;
}

/** Splits camelCase and letter/digit runs, lower-cases, and breaks at anything not a letter or digit. */
export function splitWords(name: string): string[] {
	return name
		.replace(/(\p{Ll})(\p{Lu})/gu, '$1 $2')
		.replace(/(\p{Lu}+)(\p{Lu}\p{Ll})/gu, '$1 $2')
		.replace(/(\p{L})(\p{N})/gu, '$1 $2')
		.replace(/(\p{N})(\p{L})/gu, '$1 $2')
		.toLowerCase()
		.split(/[^\p{L}\p{N}]+/u)
		.filter(Boolean);
}

const setKey = (words: readonly string[]) => [...new Set(words)].sort().join(' ');

/** Plural → singular for words long enough to be plurals ("temps", "pressures"; not "gas", "status"). */
const singular = (w: string) => (w.length > 3 && /[^su]s$/.test(w) ? w.slice(0, -1) : w);

/** Normalisation built from one synonym table. */
export interface NameMatcher {
	describe(name: string): NameInfo;
	concepts: readonly Concept[];
}

/** Built-in data merged with a workspace's additions (a concept with a known id gains names). */
export function mergeSynonyms(extra?: SynonymTableInput): SynonymTable {
	const base = synonymTableSchema.parse(builtIn);
	if (!extra) return base;
	const add = synonymTableSchema.parse(extra);
	const concepts = base.concepts.map((c) => ({ ...c, names: [...c.names] }));
	for (const concept of add.concepts) {
		const known = concepts.find((c) => c.id === concept.id);
		if (known) {
			known.names.push(...concept.names);
			known.quantity = concept.quantity ?? known.quantity;
			known.family = concept.family ?? known.family;
		} else concepts.push({ ...concept, names: [...concept.names] });
	}
	return {
		abbreviations: { ...base.abbreviations, ...add.abbreviations },
		unitWords: [...base.unitWords, ...add.unitWords],
		concepts
	};
}

export function createNameMatcher(table: SynonymTable = mergeSynonyms()): NameMatcher {
	const abbreviations = new Map(
		Object.entries(table.abbreviations).map(([k, v]) => [k.toLowerCase(), splitWords(v)])
	);
	const unitWords = new Set(table.unitWords.map((w) => w.toLowerCase()));

	const rawWords = (name: string) => {
		const all = splitWords(name);
		const kept = all.filter((w) => !unitWords.has(w));
		return kept.length ? kept : all;
	};
	const expand = (raw: readonly string[]) => [
		...new Set(
			raw.flatMap((w) => abbreviations.get(w) ?? abbreviations.get(singular(w)) ?? [singular(w)])
		)
	];

	// Each concept name indexed both as written and expanded, so "ECT" and "Coolant temp" both find it.
	const byRaw = new Map<string, Concept>();
	const byWords = new Map<string, Concept>();
	for (const concept of table.concepts) {
		for (const name of concept.names) {
			const raw = rawWords(name);
			if (!byRaw.has(setKey(raw))) byRaw.set(setKey(raw), concept);
			if (!byWords.has(setKey(expand(raw)))) byWords.set(setKey(expand(raw)), concept);
		}
	}

	return {
		concepts: table.concepts,
		describe(name) {
			const raw = rawWords(name);
			const words = expand(raw);
			const concept = byRaw.get(setKey(raw)) ?? byWords.get(setKey(words)) ?? null;
			return { name, raw, words, concept };
		}
	};
}

/** The words a concept stands for: its first name, expanded. */
function conceptWords(matcher: NameMatcher, concept: Concept): string[] {
	return matcher.describe(concept.names[0]).words;
}

const label = (concept: Concept) => concept.names[0];

export interface NameMatch {
	/** 0 (nothing alike) … 1 (the same name). */
	score: number;
	reason: string;
}

/**
 * How alike a wanted channel's name and a signal's name are:
 *  1.00  the same words after normalisation;
 *  0.95  both in one synonym group ("ECT" ~ "CoolantTemp");
 *  0.90  groups of one family ("AFR" ~ "Lambda");
 *  0     two different groups ("OilTemp" vs "CoolantTemp"), however many words they share;
 *  else  0.9 × Dice coefficient of the word sets, a name in a group standing for the group's words.
 */
export function matchNames(matcher: NameMatcher, wanted: NameInfo, signal: NameInfo): NameMatch {
	const w = wanted.concept;
	const s = signal.concept;
	if (setKey(wanted.words) === setKey(signal.words))
		return {
			score: 1,
			reason: `"${wanted.name}" and "${signal.name}" are the same name once normalised (${signal.words.join(' ')})`
		};
	if (w && s) {
		if (w.id === s.id)
			return {
				score: 0.95,
				reason: `"${wanted.name}" and "${signal.name}" are synonyms for ${label(w)}`
			};
		if (w.family && w.family === s.family)
			return {
				score: 0.9,
				reason: `"${wanted.name}" (${label(w)}) and "${signal.name}" (${label(s)}) are related ${w.family} measures`
			};
		return {
			score: 0,
			reason: `"${wanted.name}" is ${label(w)} but "${signal.name}" is ${label(s)}`
		};
	}
	const a = new Set(w ? conceptWords(matcher, w) : wanted.words);
	const b = new Set(s ? conceptWords(matcher, s) : signal.words);
	const shared = [...a].filter((x) => b.has(x));
	const dice = (2 * shared.length) / (a.size + b.size);
	if (shared.length === 0) return { score: 0, reason: 'names share no word' };
	return {
		score: 0.9 * dice,
		reason: `names share ${shared.map((x) => `"${x}"`).join(', ')}${w ? ` ("${wanted.name}" read as ${label(w)})` : ''}${s ? ` ("${signal.name}" read as ${label(s)})` : ''}`
	};
}

/** The quantity a signal's name implies, when it belongs to a synonym group that says so. */
export function impliedQuantity(info: NameInfo): Quantity | undefined {
	return info.concept?.quantity;
}
