/**
 * The browser's working copy of a versioned draft (a map's, a receiver profile's): what was last
 * saved, whether the copy differs, saving with the version the server expects (a 409 means someone
 * else saved first: reload, never overwrite), undo of the last edit, and the question to ask before
 * leaving with unsaved edits. Talks to the server only through the functions it is given, so it runs
 * in unit tests without fetch and does not care which API client the page uses. The server side of
 * the same protocol is `src/lib/server/versioning/`.
 */

/** What the server says about a record: at least the caller's role (the draft is found by `DraftOf`). */
export interface DraftRecordView {
	role: string;
}

export interface DraftFailure {
	message: string;
	/** Someone else saved first (the server refused the version we sent); the way on is a reload. */
	stale: boolean;
	/** What was refused, field by field (a 400's issues), when the server said. */
	issues?: { path: string; message: string }[];
}

export interface DraftIo<D, V> {
	/** Saves `draft` over `version`; resolves to the new version, rejects on any refusal. */
	save(version: number, draft: D): Promise<{ version: number }>;
	/** The server's current view of the record. */
	load(): Promise<V>;
	/** Words for a rejection of `save` or `load`, and whether it is the stale-version refusal. */
	describe(error: unknown): DraftFailure;
}

/** Where the draft sits in a view: the record's id, version and draft. */
export type DraftOf<D, V> = (view: V) => { id: string; version: number; draft: D };

/** The navigation type SvelteKit's `beforeNavigate` gives when the document itself unloads. */
const LEAVING_THE_SITE = 'leave';

export class DraftCopy<D extends object, V extends DraftRecordView> {
	#io: DraftIo<D, V>;
	#of: DraftOf<D, V>;
	#view = $state.raw<V>() as V;
	#draft = $state.raw<D>() as D;
	#version = $state(0);
	#savedJson = $state('');
	#saving = $state(false);
	#lastEdit = $state.raw<{ what: string; before: D } | null>(null);
	#savedHereAt = $state<string | null>(null);

	/** A line for the person after a save, reload or other server-side change; cleared by the next edit. */
	notice = $state<string | null>(null);
	/** Why the last save, reload or page action failed; cleared when one succeeds. */
	failure = $state<DraftFailure | null>(null);

	readonly dirty = $derived(JSON.stringify(this.#draft) !== this.#savedJson);
	readonly editable = $derived(this.#view.role !== 'viewer');

	constructor(initial: V, io: DraftIo<D, V>, of: DraftOf<D, V>) {
		this.#io = io;
		this.#of = of;
		this.#adopt(initial);
	}

	/** The server's view the copy was last loaded from (name, revisions and so on). */
	get view(): V {
		return this.#view;
	}
	/** The working copy. Replace it through `change`, never by mutating it. */
	get draft(): D {
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
	change(patch: Partial<D>, what: string): void {
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
		this.#draft = JSON.parse(this.#savedJson) as D;
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
	 * Server data arriving through navigation or a reload after a form: another record, or a newer
	 * version of this one, replaces the working copy; the same version refreshes what is around it
	 * (revisions, who saved last) and keeps the unsaved edits; an older one is ignored. Returns
	 * whether the working copy was replaced.
	 */
	receive(next: V): boolean {
		const incoming = this.#of(next);
		if (incoming.id === this.#of(this.#view).id && incoming.version <= this.#version) {
			if (incoming.version === this.#version) this.#view = next;
			return false;
		}
		this.#adopt(next);
		return true;
	}

	/**
	 * The server changed the draft itself under a new version (a rename, say): apply the same change
	 * to the saved and the working copy (and the undo step) without touching other unsaved edits.
	 */
	serverChanged(version: number, change: (draft: D) => D, view?: V): void {
		if (view) this.#view = view;
		this.#version = version;
		this.#savedJson = JSON.stringify(change(JSON.parse(this.#savedJson) as D));
		this.#draft = change(this.#draft);
		if (this.#lastEdit)
			this.#lastEdit = { ...this.#lastEdit, before: change(this.#lastEdit.before) };
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
		const { draft, version } = this.#of(next);
		this.#view = next;
		this.#draft = draft;
		this.#version = version;
		this.#savedJson = JSON.stringify(draft);
		this.#lastEdit = null;
		this.#savedHereAt = null;
		this.failure = null;
		this.notice = null;
	}
}
