/**
 * The working copy of a map's draft that both editor pages (the map page and the frame page) edit:
 * the shared working copy of a versioned draft (`$lib/drafts/draft-copy.svelte.ts`: save with the
 * version the server expects, 409 → reload, undo, the leave guard) plus the map's own lint and settings.
 */
import { lintMap } from '$lib/can/lint';
import type { CanMap } from '$lib/can/map';
import {
	DraftCopy,
	type DraftFailure,
	type DraftIo as CopyIo
} from '$lib/drafts/draft-copy.svelte';

export type { DraftFailure };

/** What the server says about a map: at least its id, name, draft, draft version and the caller's role. */
export interface DraftView {
	map: { id: string; name: string; version: number; draft: CanMap };
	role: string;
}

export type DraftIo<V extends DraftView> = CopyIo<CanMap, V>;

export class MapDraft<V extends DraftView = DraftView> extends DraftCopy<CanMap, V> {
	/** Lint runs in the browser on every edit, with the same core library the server uses. */
	readonly lint = $derived(lintMap(this.draft));

	constructor(initial: V, io: DraftIo<V>) {
		super(initial, io, (view) => view.map);
	}

	/**
	 * A map setting (name, bit rate) the server changed in the draft under a new version: mirror it
	 * in both the saved and the working copy without touching other unsaved edits.
	 */
	applied(patch: Partial<Pick<CanMap, 'name' | 'bitrate'>>, version: number): void {
		const name = patch.name ?? this.view.map.name;
		this.serverChanged(version, (draft) => ({ ...draft, ...patch }), {
			...this.view,
			map: { ...this.view.map, name }
		});
	}
}
