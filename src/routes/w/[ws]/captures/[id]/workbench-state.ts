/**
 * The workbench's state in its URL, so a view survives a reload and can be shared as a link:
 *
 * `?decode=…&panel=frames&dock=below&plot=c1,c2;d0&from=1.5&to=3&fx=Boost|kPa|ManifoldPressure-101.3
 *  &tool=xy&x=c1&y=c2&hist=c1&above=100`
 *
 * `plot` lists strips separated by `;`, each a comma list of channels (`c<n>` decoded, `d<n>` the
 * n-th derived channel); each `fx` is one derived channel as `name|unit|formula` (the formula
 * may hold `|`). Anything that does not read is dropped, so an old or edited link still opens.
 */
import {
	workbenchStateSchema,
	type ChannelRef,
	type DerivedDefinition,
	type WorkbenchState
} from '$lib/api/workbench';

export const defaultState = (): WorkbenchState => workbenchStateSchema.parse({});

function readDerived(values: string[]): DerivedDefinition[] {
	return values.flatMap((v) => {
		const [name, unit, ...rest] = v.split('|');
		const formula = rest.join('|');
		return name && formula ? [{ name, unit: unit ?? '', formula }] : [];
	});
}

/** The state from a URL's query; parts that do not read fall back to their defaults one by one. */
export function stateFromSearch(params: URLSearchParams): WorkbenchState {
	const number = (key: string) => {
		const v = params.get(key);
		return v !== null && v.trim() !== '' && Number.isFinite(Number(v)) ? Number(v) : undefined;
	};
	const candidate: Record<string, unknown> = {
		decode: params.get('decode') ?? undefined,
		panel: params.get('panel') ?? undefined,
		dock: params.get('dock') ?? undefined,
		strips: (params.get('plot') ?? '')
			.split(';')
			.map((strip) => strip.split(',').filter(Boolean))
			.filter((strip) => strip.length > 0),
		from: number('from'),
		to: number('to'),
		derived: readDerived(params.getAll('fx')),
		tool: params.get('tool') ?? undefined,
		x: params.get('x') ?? undefined,
		y: params.get('y') ?? undefined,
		hist: params.get('hist') ?? undefined,
		above: number('above')
	};
	const whole = workbenchStateSchema.safeParse(candidate);
	if (whole.success) return whole.data;
	// Keep every field that reads on its own.
	const state: Record<string, unknown> = defaultState();
	for (const [key, value] of Object.entries(candidate)) {
		const one = workbenchStateSchema.safeParse({ [key]: value });
		if (one.success) state[key] = (one.data as Record<string, unknown>)[key];
	}
	// Each field reads; only the window can still be wrong as a pair (it ends before it starts).
	const checked = workbenchStateSchema.safeParse(state);
	return checked.success
		? checked.data
		: workbenchStateSchema.parse({ ...state, from: undefined, to: undefined });
}

/** Times in the URL: enough digits for a microsecond, no binary noise. */
const timeText = (t: number) => String(Number(t.toPrecision(12)));

/** The query string of a state; defaults are left out so links stay short. */
export function stateToSearch(state: WorkbenchState): URLSearchParams {
	const d = defaultState();
	const p = new URLSearchParams();
	if (state.decode) p.set('decode', state.decode);
	if (state.panel !== d.panel) p.set('panel', state.panel);
	if (state.dock !== d.dock) p.set('dock', state.dock);
	if (state.strips.length) p.set('plot', state.strips.map((s) => s.join(',')).join(';'));
	if (state.from !== undefined) p.set('from', timeText(state.from));
	if (state.to !== undefined) p.set('to', timeText(state.to));
	for (const fx of state.derived) p.append('fx', `${fx.name}|${fx.unit}|${fx.formula}`);
	if (state.tool !== d.tool) p.set('tool', state.tool);
	if (state.x) p.set('x', state.x);
	if (state.y) p.set('y', state.y);
	if (state.hist) p.set('hist', state.hist);
	if (state.above !== undefined) p.set('above', String(state.above));
	return p;
}

/** Every channel the plot shows, in strip order, without repeats. */
export const plottedRefs = (state: WorkbenchState): ChannelRef[] => [
	...new Set(state.strips.flat())
];

/** Drops references to derived channel `k` and renumbers the ones after it. */
export function withoutDerived(state: WorkbenchState, k: number): WorkbenchState {
	const shift = (ref: ChannelRef | undefined): ChannelRef | undefined => {
		if (!ref?.startsWith('d')) return ref;
		const n = Number(ref.slice(1));
		return n === k ? undefined : n > k ? `d${n - 1}` : ref;
	};
	return {
		...state,
		derived: state.derived.filter((_, i) => i !== k),
		strips: state.strips
			.map((strip) => strip.map(shift).filter((r): r is ChannelRef => r !== undefined))
			.filter((strip) => strip.length > 0),
		x: shift(state.x),
		y: shift(state.y),
		hist: shift(state.hist)
	};
}
