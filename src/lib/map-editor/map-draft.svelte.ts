/**
 * The working copy of a map's draft that both editor pages (the map page and the frame page) edit:
 * what was last saved, whether the copy differs, saving with the version the server expects (a 409
 * means someone else saved first: reload, never overwrite), undo of the last edit, and the question to
 * ask before leaving with unsaved edits. Talks to the server only through the functions it is given,
 * so it runs in unit tests without fetch and does not care which API client the page uses.
 */
import { lintMap } from '$lib/can/lint';
import type { CanMap } from '$lib/can/map';

/** What the server says about a map: at least its id, name, draft, draft version and the caller's role. */
export interface DraftView {
	map: { id: string; name: string; version: number; draft: CanMap };
	role: string;
}

export interface DraftFailure {
	message: string;
	/** Someone else saved first (the server refused the version we sent); the way on is a reload. */
	stale: boolean;
}

export interface DraftIo<V extends DraftView> {
	/** Saves `draft` over `version`; resolves to the new version, rejects on any refusal. */
	save(version: number, draft: CanMap): Promise<{ version: number }>;
	/** The server's current view of the map. */
	load(): Promise<V>;
	/** Words for a rejection of `save` or `load`, and whether it is the stale-version refusal. */
	describe(error: unknown): DraftFailure;
}

/** The navigation type SvelteKit's `beforeNavigate` gives when the document itself unloads. */
const LEAVING_THE_SITE = 'leave';

export class MapDraft<V extends DraftView = DraftView> {
	#io: DraftIo<V>;
	#view = $state.raw<V>() as V;
	#draft = $state.raw<CanMap>() as CanMap;
	#version = $state(0);
	#savedJson = $state('');
	#saving = $state(false);
	#lastEdit = $state.raw<{ what: string; before: CanMap } | null>(null);
	#savedHereAt = $state<string | null>(null);

	/** A line for the person after a save, reload or other server-side change; cleared by the next edit. */
	notice = $state<string | null>(null);
	/** Why the last save, reload or page action failed; cleared when one succeeds. */
	failure = $state<DraftFailure | null>(null);

	readonly dirty = $derived(JSON.stringify(this.#draft) !== this.#savedJson);
	readonly editable = $derived(this.#view.role !== 'viewer');
	/** Lint runs in the browser on every edit, with the same core library the server uses. */
	readonly lint = $derived(lintMap(this.#draft));

	constructor(initial: V, io: DraftIo<V>) {
		this.#io = io;
		this.#adopt(initial);
	}

	/** The server's view the copy was last loaded from (name, revisions and so on). */
	get view(): V {
		return this.#view;
	}
	/** The working copy. Replace it through `change`, never by mutating it. */
	get draft(): CanMap {
		return this.#draft;
	}
	/** The draft version the next save claims to replace. */
	get version(): number {
		return this.#version;
	}
	get saving(): boolean {
		return this.#saving;
	}
	/**
	 * When this page last saved the draft (ISO time), so "last saved" follows a save without a
	 * reload; null until it saves, and again when newer server data is adopted (which says itself).
	 */
	get savedHereAt(): string | null {
		return this.#savedHereAt;
	}
	/** What the last edit changed, while it can still be undone. */
	get undoable(): string | null {
		return this.#lastEdit?.what ?? null;
	}

	/** Applies an edit to the working copy; `what` names it for the undo line. */
	change(patch: Partial<CanMap>, what: string): void {
		if (!this.editable) return;
		this.#lastEdit = { what, before: this.#draft };
		this.#draft = { ...this.#draft, ...patch };
		this.notice = null;
	}

	// save, reload and undo are arrow properties so a page can hand them to a button as they are.

	/** Puts back the working copy as it was before the last edit (one step). */
	undo = (): void => {
		if (!this.#lastEdit) return;
		this.#draft = this.#lastEdit.before;
		this.#lastEdit = null;
		this.notice = null;
	};

	/** Drops the unsaved edits: the working copy goes back to the last saved draft. */
	discard(): void {
		this.#draft = JSON.parse(this.#savedJson) as CanMap;
		this.#lastEdit = null;
	}

	/**
	 * Saves the working copy. Resolves true when saved; a second call while one is on its way does
	 * nothing (resolves false). On failure the edits stay in place and `failure` says why.
	 */
	save = async (): Promise<boolean> => {
		if (!this.editable || this.#saving) return false;
		this.#saving = true;
		this.failure = null;
		this.notice = null;
		const sent = this.#draft;
		try {
			const { version } = await this.#io.save(this.#version, sent);
			this.#version = version;
			this.#savedJson = JSON.stringify(sent);
			// An ISO stamp, not a kept Date object: nothing mutates it.
			// eslint-disable-next-line svelte/prefer-svelte-reactivity
			this.#savedHereAt = new Date().toISOString();
			// Edits made while the save was on its way stay unsaved, and stay undoable.
			if (this.#draft === sent) this.#lastEdit = null;
			this.notice = 'Draft saved.';
			return true;
		} catch (error) {
			this.failure = this.#io.describe(error);
			return false;
		} finally {
			this.#saving = false;
		}
	};

	/** Replaces the working copy with the server's latest (unsaved edits are lost). */
	reload = async (): Promise<boolean> => {
		try {
			this.#adopt(await this.#io.load());
			this.notice = 'Reloaded the latest saved draft.';
			return true;
		} catch (error) {
			this.failure = { ...this.#io.describe(error), stale: false };
			return false;
		}
	};

	/**
	 * Server data arriving through navigation: another map, or a newer version of this one, replaces
	 * the working copy; the same or an older version does not (it would undo edits for nothing).
	 * Returns whether it was adopted.
	 */
	receive(next: V): boolean {
		if (next.map.id === this.#view.map.id && next.map.version <= this.#version) return false;
		this.#adopt(next);
		return true;
	}

	/**
	 * The server renamed the map and keeps `draft.name` in step, under a new version: mirror that in
	 * both the saved and the working copy without touching other unsaved edits.
	 */
	renamed(name: string, version: number): void {
		this.#view = { ...this.#view, map: { ...this.#view.map, name } };
		this.#version = version;
		this.#savedJson = JSON.stringify({ ...(JSON.parse(this.#savedJson) as CanMap), name });
		this.#draft = { ...this.#draft, name };
		if (this.#lastEdit)
			this.#lastEdit = { ...this.#lastEdit, before: { ...this.#lastEdit.before, name } };
	}

	/** Shows a failure of a page action (restore, rename, delete) the same way a save failure shows. */
	fail(error: unknown): void {
		this.failure = this.#io.describe(error);
	}

	/**
	 * For `beforeNavigate`: true when the navigation must be cancelled. With unsaved edits, leaving the
	 * site is cancelled so the browser asks its own question (a page cannot ask during unload); any
	 * other navigation calls `ask` and, when the person agrees to leave, drops the edits.
	 */
	leave(type: string, ask: () => boolean): boolean {
		if (!this.dirty) return false; // a viewer's copy never is: `change` refuses their edits
		if (type === LEAVING_THE_SITE || !ask()) return true;
		this.discard();
		return false;
	}

	#adopt(next: V): void {
		this.#view = next;
		this.#draft = next.map.draft;
		this.#version = next.map.version;
		this.#savedJson = JSON.stringify(next.map.draft);
		this.#lastEdit = null;
		this.#savedHereAt = null;
		this.failure = null;
		this.notice = null;
	}
}
