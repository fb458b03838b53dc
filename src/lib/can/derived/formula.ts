/**
 * Derived channels, part 1: reading a formula (docs/derived-channels.md). mathjs parses the text;
 * we then accept only the node kinds and functions listed here and turn the tree into our own
 * small program. The program is evaluated by `evaluate.ts`, never by mathjs, so nothing else of
 * mathjs (import, createUnit, evaluate, parse, assignments, matrices, strings…) is reachable from
 * a formula. Every refusal carries the 0-based character position in the text the person typed.
 */
import { create, parseDependencies, type MathNode } from 'mathjs';

/** Only the parser: no evaluation machinery is ever asked of this instance. */
const math = create({ parseDependencies });

/** Longest formula accepted: a page of text is plenty, and keeps the tree small. */
export const MAX_FORMULA_LENGTH = 500;
/** Deepest nesting accepted, so evaluation never recurses without bound. */
const MAX_DEPTH = 40;

/** A channel a formula may name. */
export interface FormulaChannel {
	index: number;
	frameName: string;
	signalName: string;
}

export interface FormulaProblem {
	message: string;
	/** 0-based character in the formula where the problem is. */
	position: number;
}

export type BinaryOp =
	'+' | '-' | '*' | '/' | '^' | 'mod' | '<' | '<=' | '>' | '>=' | '==' | '!=' | 'and' | 'or';

/** The program a formula becomes: only these shapes exist. */
export type Expr =
	| { kind: 'number'; value: number }
	| { kind: 'channel'; index: number }
	| { kind: 'neg'; arg: Expr }
	| { kind: 'not'; arg: Expr }
	| { kind: 'binary'; op: BinaryOp; left: Expr; right: Expr }
	| { kind: 'if'; condition: Expr; then: Expr; else: Expr }
	| { kind: 'abs'; arg: Expr }
	| { kind: 'minmax'; fn: 'min' | 'max'; args: Expr[] }
	| { kind: 'avg'; arg: Expr; seconds: number }
	| { kind: 'ddt'; arg: Expr }
	| { kind: 'integral'; arg: Expr };

export type FormulaResult =
	| {
			ok: true;
			expr: Expr;
			/** Channel indices the formula reads, in first-use order. */ inputs: number[];
	  }
	| { ok: false; problem: FormulaProblem };

/** The functions a formula may call, with their argument counts — the whole list. */
export const FORMULA_FUNCTIONS = {
	abs: 'abs(x): the size of x without its sign',
	min: 'min(a, b, …): the smallest of two or more values, sample by sample',
	max: 'max(a, b, …): the largest of two or more values, sample by sample',
	avg: 'avg(x, seconds): the mean of x over the trailing window of that many seconds',
	ddt: 'ddt(x): how fast x changes, per second',
	integral: 'integral(x): the running area under x over time, from the first sample'
} as const;

const OPERATORS: Record<string, BinaryOp> = {
	add: '+',
	subtract: '-',
	multiply: '*',
	dotMultiply: '*',
	divide: '/',
	dotDivide: '/',
	pow: '^',
	dotPow: '^',
	mod: 'mod',
	smaller: '<',
	smallerEq: '<=',
	larger: '>',
	largerEq: '>=',
	equal: '==',
	unequal: '!=',
	and: 'and',
	or: 'or'
};

class Refusal extends Error {
	constructor(
		message: string,
		readonly position: number
	) {
		super(message);
	}
}

/** `{Frame name.Signal name}` references, replaced by plain identifiers before mathjs reads the text. */
interface Braced {
	/** The identifier put in its place. */
	token: string;
	name: string;
	/** Where the `{` was in the original text. */
	position: number;
}

/**
 * Replaces each `{…}` by an identifier of the same length or more, and keeps a map from positions
 * in the new text back to the original, so mathjs's error positions point at what was typed.
 */
function replaceBraces(text: string): { text: string; braced: Braced[]; original: number[] } {
	const braced: Braced[] = [];
	const original: number[] = [];
	let out = '';
	for (let i = 0; i < text.length;) {
		if (text[i] === '}') throw new Refusal('A “}” closes a channel name that was never opened.', i);
		if (text[i] !== '{') {
			original.push(i);
			out += text[i++];
			continue;
		}
		const end = text.indexOf('}', i + 1);
		if (end < 0) throw new Refusal('A channel name in { } is not closed with “}”.', i);
		const name = text.slice(i + 1, end).trim();
		if (!name) throw new Refusal('Empty { }: write a channel name inside.', i);
		if (name.includes('{')) throw new Refusal('Channel names in { } cannot be nested.', i);
		const token = `__channel${braced.length}__`;
		braced.push({ token, name, position: i });
		for (let k = 0; k < token.length; k++) original.push(i + Math.min(k, end - i));
		out += token;
		i = end + 1;
	}
	original.push(text.length);
	return { text: out, braced, original };
}

/**
 * Where a name (as a whole word) or an operator first appears in the text, for errors about a
 * node: mathjs keeps no positions in its tree.
 */
function positionOf(text: string, token: string): number {
	if (!/^[A-Za-z_]\w*$/.test(token)) return Math.max(0, text.indexOf(token));
	const match = new RegExp(`(^|\\W)${token}(?!\\w)`).exec(text);
	return match ? match.index + match[1].length : 0;
}

function channelFinder(channels: readonly FormulaChannel[]) {
	const bySignal = new Map<string, FormulaChannel[]>();
	const byFull = new Map<string, FormulaChannel>();
	for (const c of channels) {
		bySignal.set(c.signalName, [...(bySignal.get(c.signalName) ?? []), c]);
		if (!byFull.has(`${c.frameName}.${c.signalName}`))
			byFull.set(`${c.frameName}.${c.signalName}`, c);
	}
	return (name: string, position: number): FormulaChannel => {
		const full = byFull.get(name);
		if (full) return full;
		const matches = bySignal.get(name) ?? [];
		if (matches.length === 1) return matches[0];
		if (matches.length > 1) {
			throw new Refusal(
				`${name} is a signal of ${matches.map((m) => m.frameName).join(' and ')}; write ${matches[0].frameName}.${name} to choose one.`,
				position
			);
		}
		throw new Refusal(
			`No channel is called “${name}”. Use a signal name, Frame.Signal, or {Frame name.Signal name}.`,
			position
		);
	};
}

/**
 * Reads a formula over the given channels. Channels are named by signal (`EngineSpeed`), by frame
 * and signal (`EngineCore.EngineSpeed`), or in braces when a name has spaces or other characters
 * (`{Engine core.Engine speed}`).
 */
export function parseFormula(text: string, channels: readonly FormulaChannel[]): FormulaResult {
	try {
		if (!text.trim()) throw new Refusal('Write a formula, e.g. ManifoldPressure - 101.3.', 0);
		if (text.length > MAX_FORMULA_LENGTH)
			throw new Refusal(
				`A formula may have at most ${MAX_FORMULA_LENGTH} characters; this one has ${text.length}.`,
				MAX_FORMULA_LENGTH
			);
		const { text: plain, braced, original } = replaceBraces(text);
		let node: MathNode;
		try {
			node = math.parse(plain);
		} catch (error) {
			const char = (error as { char?: unknown }).char;
			// mathjs counts characters from 1.
			const at = typeof char === 'number' ? (original[Math.max(0, char - 1)] ?? text.length) : 0;
			const message = (error instanceof Error ? error.message : String(error)).replace(
				/\s*\(char \d+\)$/,
				''
			);
			throw new Refusal(`${message}.`, at);
		}
		const find = channelFinder(channels);
		const inputs: number[] = [];
		const at = (word: string) => original[positionOf(plain, word)] ?? 0;

		const channel = (name: string, position: number): Expr => {
			const c = find(name, position);
			if (!inputs.includes(c.index)) inputs.push(c.index);
			return { kind: 'channel', index: c.index };
		};

		const constantSeconds = (arg: Expr, fn: string): number => {
			if (arg.kind !== 'number' || !(arg.value > 0) || !Number.isFinite(arg.value))
				throw new Refusal(
					`The window of ${fn}(x, seconds) must be a number of seconds above 0, like 0.5.`,
					at(fn)
				);
			return arg.value;
		};

		const convert = (n: MathNode, depth: number): Expr => {
			if (depth > MAX_DEPTH)
				throw new Refusal(`The formula is nested more than ${MAX_DEPTH} levels deep.`, 0);
			const next = (child: MathNode) => convert(child, depth + 1);
			switch (n.type) {
				case 'ConstantNode': {
					const value = (n as unknown as { value: unknown }).value;
					if (typeof value !== 'number' || !Number.isFinite(value))
						throw new Refusal(
							'Only numbers may be written as constants (no text in quotes).',
							at(String(value))
						);
					return { kind: 'number', value };
				}
				case 'ParenthesisNode':
					return next((n as unknown as { content: MathNode }).content);
				case 'SymbolNode': {
					const name = (n as unknown as { name: string }).name;
					const brace = braced.find((b) => b.token === name);
					if (brace) return channel(brace.name, brace.position);
					return channel(name, at(name));
				}
				case 'AccessorNode': {
					// Frame.Signal: mathjs reads the dot as property access on a symbol.
					const { object, index } = n as unknown as {
						object: MathNode;
						index: { dotNotation?: boolean; dimensions: MathNode[] };
					};
					const property = index.dimensions[0] as unknown as { value?: unknown };
					if (
						object.type === 'SymbolNode' &&
						index.dotNotation &&
						typeof property.value === 'string'
					) {
						const frame = (object as unknown as { name: string }).name;
						return channel(`${frame}.${property.value}`, at(frame));
					}
					throw new Refusal(
						'Only Frame.Signal may be written with a dot; use {…} for names with dots or spaces.',
						at((object as unknown as { name?: string }).name ?? '.')
					);
				}
				case 'OperatorNode': {
					const { fn, op, args } = n as unknown as { fn: string; op: string; args: MathNode[] };
					if (args.length === 1) {
						if (fn === 'unaryMinus') return { kind: 'neg', arg: next(args[0]) };
						if (fn === 'unaryPlus') return next(args[0]);
						if (fn === 'not') return { kind: 'not', arg: next(args[0]) };
					} else if (args.length === 2 && OPERATORS[fn]) {
						return { kind: 'binary', op: OPERATORS[fn], left: next(args[0]), right: next(args[1]) };
					}
					throw new Refusal(`The operator “${op}” cannot be used in a formula.`, at(op));
				}
				case 'ConditionalNode': {
					const c = n as unknown as {
						condition: MathNode;
						trueExpr: MathNode;
						falseExpr: MathNode;
					};
					return {
						kind: 'if',
						condition: next(c.condition),
						then: next(c.trueExpr),
						else: next(c.falseExpr)
					};
				}
				case 'FunctionNode': {
					const { fn, args } = n as unknown as { fn: MathNode; args: MathNode[] };
					const name = fn.type === 'SymbolNode' ? (fn as unknown as { name: string }).name : '';
					const where = name ? at(name) : 0;
					if (!Object.hasOwn(FORMULA_FUNCTIONS, name))
						throw new Refusal(
							`${name ? `“${name}” is not` : 'That is not'} a formula function; the functions are ${Object.keys(FORMULA_FUNCTIONS).join(', ')}.`,
							where
						);
					const list = args.map(next);
					const count = (wanted: number) => {
						if (list.length !== wanted)
							throw new Refusal(
								`${FORMULA_FUNCTIONS[name as keyof typeof FORMULA_FUNCTIONS]} — it takes ${wanted} argument${wanted === 1 ? '' : 's'}, not ${list.length}.`,
								where
							);
					};
					switch (name) {
						case 'abs':
							count(1);
							return { kind: 'abs', arg: list[0] };
						case 'min':
						case 'max':
							if (list.length < 2)
								throw new Refusal(
									`${name}( ) compares two or more values, like ${name}(a, b).`,
									where
								);
							return { kind: 'minmax', fn: name, args: list };
						case 'avg':
							count(2);
							return { kind: 'avg', arg: list[0], seconds: constantSeconds(list[1], name) };
						case 'ddt':
							count(1);
							return { kind: 'ddt', arg: list[0] };
						default:
							count(1);
							return { kind: 'integral', arg: list[0] };
					}
				}
				case 'AssignmentNode':
				case 'FunctionAssignmentNode':
					throw new Refusal('A formula cannot assign names; write only the expression.', at('='));
				default:
					throw new Refusal(
						`${describeNode(n.type)} cannot be used in a formula.`,
						at(NODE_TOKENS[n.type] ?? '')
					);
			}
		};
		const expr = convert(node, 0);
		if (inputs.length === 0) throw new Refusal('The formula must use at least one channel.', 0);
		return { ok: true, expr, inputs };
	} catch (error) {
		if (error instanceof Refusal)
			return { ok: false, problem: { message: error.message, position: error.position } };
		throw error;
	}
}

const NODE_TOKENS: Record<string, string> = {
	ArrayNode: '[',
	ObjectNode: '__channel', // `{` was taken as a channel name
	BlockNode: ';',
	RangeNode: ':',
	RelationalNode: '<'
};

function describeNode(type: string): string {
	const names: Record<string, string> = {
		ArrayNode: 'A list in [ ]',
		ObjectNode: 'An object in { }',
		BlockNode: 'More than one expression',
		IndexNode: 'Indexing',
		RangeNode: 'A range (a:b)',
		RelationalNode: 'A chain of comparisons (a < b < c)'
	};
	return names[type] ?? 'That kind of expression';
}
