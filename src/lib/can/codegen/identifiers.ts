/**
 * C identifiers for generated code (docs/codegen.md): the snake_case rule, the file prefix, and a
 * deterministic way to turn any frame or signal name into a valid, unique C name, saying so in a note.
 */
import { z } from 'zod';

/** A remark about the generated code, placed like a map problem (`frames[2].signals[0]`). */
export interface CodegenNote {
	path: string;
	message: string;
}

/**
 * The naming rule of docs/codegen.md, exactly: an underscore before every upper-case letter that follows
 * a lower-case letter or a digit, then lower case, and any run of other characters one underscore.
 * Letters outside ASCII count as other characters (C identifiers are ASCII). The result may start or
 * end with an underscore or be "_"; `cName` makes it usable.
 */
export function snakeCase(name: string): string {
	return name
		.replace(/(?<=[a-z0-9])(?=[A-Z])/g, '_')
		.replace(/[^A-Za-z0-9]+/g, '_')
		.toLowerCase();
}

/**
 * C99, C11/C23 and C++ keywords and alternative tokens (the header may be included from C++), and the
 * lower-case object-like macros of standard headers firmware may include before ours (`errno`,
 * <complex.h>'s `complex`, <stdnoreturn.h>'s `noreturn`): a struct member may not be called any of them.
 * Only lower-case words: snake_case never produces anything else.
 */
const RESERVED_WORDS = new Set(
	(
		'auto break case char const continue default do double else enum extern float for goto if inline ' +
		'int long register restrict return short signed sizeof static struct switch typedef union unsigned ' +
		'void volatile while bool true false alignas alignof static_assert thread_local typeof ' +
		'typeof_unqual nullptr constexpr and and_eq asm bitand bitor catch char8_t char16_t char32_t class ' +
		'compl concept consteval constinit const_cast co_await co_return co_yield decltype delete ' +
		'dynamic_cast explicit export friend mutable namespace new noexcept not not_eq operator or or_eq ' +
		'private protected public reinterpret_cast requires static_cast template this throw try typeid ' +
		'typename using virtual wchar_t xor xor_eq errno complex imaginary noreturn math_errhandling'
	).split(' ')
);

export function isReservedWord(name: string): boolean {
	return RESERVED_WORDS.has(name);
}

/** Prefixes whose identifiers C99 7.26 reserves for the standard library (`int…_t`, `SIG_…`, `LC_…`). */
const RESERVED_PREFIX = /^(u?int|sig|lc$)/;

/** The `--prefix` of generated names and files: a short lower-case C identifier. */
export const codegenPrefixSchema = z
	.string()
	.regex(
		/^[a-z][a-z0-9]*(_[a-z0-9]+)*$/,
		'prefix must start with a lower-case letter and hold only a–z, 0–9 and single underscores inside (e.g. fw)'
	)
	.max(32, 'prefix must be at most 32 characters')
	.refine(
		(p) => !RESERVED_PREFIX.test(p),
		'prefix must not start with "int", "uint" or "sig" or be "lc": the C standard library reserves such names'
	);

/**
 * `snakeCase` trimmed of leading and trailing underscores, so joining names with "_" never makes "__"
 * (reserved in C++) and a name never starts with "_" (reserved at file scope in C). May be empty.
 */
export function cName(name: string): string {
	return snakeCase(name).replace(/^_+|_+$/g, '');
}

/** One name to allocate: where it comes from and the identifiers it would produce. */
interface Claim {
	path: string;
	/** The map's own name, for notes. */
	original: string;
	/** Preferred C name (already valid on its own). */
	base: string;
	/** Why `base` differs from `cName(original)`, if it does. */
	adjusted: string | null;
	/** Every identifier this name would claim; all must be free. */
	identifiers: (name: string) => string[];
}

/**
 * Gives every claim a name whose identifiers are all unused, deterministically: first every claim that
 * can keep its preferred name does (in order), then the rest get the first free `<base>_2`, `<base>_3`, …
 * — so an unproblematic name is never displaced by a later clash. Identifiers are added to `taken`.
 */
export function allocateNames(claims: Claim[], taken: Set<string>, notes: CodegenNote[]): string[] {
	const names: (string | null)[] = claims.map(() => null);
	const free = (claim: Claim, name: string) =>
		claim.identifiers(name).every((id) => !taken.has(id));
	const take = (claim: Claim, name: string) => {
		for (const id of claim.identifiers(name)) taken.add(id);
	};
	claims.forEach((claim, i) => {
		if (!free(claim, claim.base)) return;
		take(claim, claim.base);
		names[i] = claim.base;
	});
	claims.forEach((claim, i) => {
		if (names[i] !== null) {
			if (claim.adjusted)
				notes.push({
					path: claim.path,
					message: `"${claim.original}" is named ${claim.base}: ${claim.adjusted}`
				});
			return;
		}
		let n = 2;
		while (!free(claim, `${claim.base}_${n}`)) n++;
		const name = `${claim.base}_${n}`;
		take(claim, name);
		names[i] = name;
		const why = claim.adjusted ? `${claim.adjusted}, and ` : '';
		notes.push({
			path: claim.path,
			message: `"${claim.original}" is named ${name}: ${why}${claim.base} is already used by another name`
		});
	});
	return names as string[];
}

/** The preferred C name of a frame or signal and why it departs from the plain rule, if it does. */
export function preferredName(
	original: string,
	fallback: string,
	member: boolean
): { base: string; adjusted: string | null } {
	const snake = snakeCase(original);
	const trimmed = cName(original);
	if (trimmed === '')
		return { base: fallback, adjusted: 'its name has no letters or digits to build a C name from' };
	if (member && /^[0-9]/.test(trimmed))
		return { base: `s_${trimmed}`, adjusted: 'a C name cannot start with a digit' };
	if (member && isReservedWord(trimmed))
		return { base: `s_${trimmed}`, adjusted: `${trimmed} is a C or C++ keyword or standard macro` };
	if (trimmed !== snake)
		return {
			base: trimmed,
			adjusted: `leading and trailing underscores of ${snake} are dropped`
		};
	return { base: trimmed, adjusted: null };
}
