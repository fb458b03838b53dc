import { describe, expect, it, vi } from 'vitest';
import { canMapSchema, type CanMap } from '$lib/can/map';
import { MapDraft, type DraftIo, type DraftView } from './map-draft.svelte';

// An invented bench map: one frame with one 16-bit signal.
const benchMap = (): CanMap =>
	canMapSchema.parse({
		format: 'framewright-map@1',
		name: 'Bench node',
		frames: [
			{
				name: 'CoolantStatus',
				id: '0x3A0',
				signals: [{ name: 'CoolantTemp', startBit: 0, length: 16, scale: 0.1 }]
			}
		]
	});

class Refused extends Error {
	constructor(
		readonly status: number,
		message: string
	) {
		super(message);
	}
}

/**
 * A stand-in for the server's draft endpoint with its optimistic lock: a save naming any version but
 * the current one is refused with 409; otherwise it is stored under the next version.
 */
class FakeServer {
	version = 7;
	draft = benchMap();
	role = 'editor';
	saves: { version: number; draft: CanMap }[] = [];
	/** The next save fails this way instead (e.g. a network error), once. */
	failNext: Error | null = null;
	/** Holds the next save's answer until `release()` is called. */
	#held: (() => void) | null = null;
	holdNext = false;

	view(id = 'map-1'): DraftView {
		return {
			map: { id, name: this.draft.name, version: this.version, draft: structuredClone(this.draft) },
			role: this.role
		};
	}

	/** Someone else saves a change of their own. */
	saveElsewhere(change: Partial<CanMap>) {
		this.draft = { ...this.draft, ...change };
		this.version += 1;
	}

	release() {
		this.#held?.();
	}

	io(): DraftIo<DraftView> {
		return {
			save: async (version, draft) => {
				this.saves.push({ version, draft: structuredClone(draft) });
				if (this.holdNext) {
					this.holdNext = false;
					await new Promise<void>((resolve) => (this.#held = resolve));
				}
				if (this.failNext) {
					const error = this.failNext;
					this.failNext = null;
					throw error;
				}
				if (version !== this.version) throw new Refused(409, 'Someone else saved first.');
				this.draft = structuredClone(draft);
				this.version += 1;
				return { version: this.version };
			},
			load: async () => this.view(),
			describe: (error) => ({
				message: error instanceof Error ? error.message : String(error),
				stale: error instanceof Refused && error.status === 409
			})
		};
	}
}

function setUp() {
	const server = new FakeServer();
	const editor = new MapDraft(server.view(), server.io());
	return { server, editor };
}

const renameSignal = (map: CanMap, name: string) => ({
	frames: map.frames.map((f) => ({ ...f, signals: f.signals.map((s) => ({ ...s, name })) }))
});

describe('MapDraft', () => {
	it('is dirty while the working copy differs from the last saved draft, not merely after an edit', () => {
		const { editor } = setUp();
		expect(editor.dirty).toBe(false);
		editor.change({ bitrate: 250_000 }, 'bit rate');
		expect(editor.dirty).toBe(true);
		expect(editor.draft.bitrate).toBe(250_000);
		editor.change({ bitrate: 500_000 }, 'bit rate'); // back to what was saved
		expect(editor.dirty).toBe(false);
	});

	it('saves under the loaded version, takes the new version and clears dirty', async () => {
		const { server, editor } = setUp();
		const before = Date.now();
		expect(editor.savedHereAt).toBeNull();
		editor.change(renameSignal(editor.draft, 'EngineCoolant'), 'signal name');
		expect(await editor.save()).toBe(true);
		expect(server.saves.map((s) => s.version)).toEqual([7]);
		expect(server.draft.frames[0].signals[0].name).toBe('EngineCoolant');
		expect(editor.version).toBe(8);
		expect(editor.dirty).toBe(false);
		expect(editor.notice).toBe('Draft saved.');
		// "Last saved" follows the save: the time it succeeded, not the time the page was loaded.
		expect(Date.parse(editor.savedHereAt!)).toBeGreaterThanOrEqual(before);
		expect(editor.failure).toBeNull();
		// The next save claims the new version, so the server accepts it too.
		editor.change({ bitrate: 125_000 }, 'bit rate');
		expect(await editor.save()).toBe(true);
		expect(server.saves.map((s) => s.version)).toEqual([7, 8]);
		expect(server.draft.bitrate).toBe(125_000);
	});

	it('on a 409 keeps the edits and reports a stale failure; reload then adopts the server copy', async () => {
		const { server, editor } = setUp();
		server.saveElsewhere({ bitrate: 1_000_000 });
		editor.change({ bitrate: 250_000 }, 'bit rate');
		expect(await editor.save()).toBe(false);
		expect(editor.failure).toEqual({ message: 'Someone else saved first.', stale: true });
		expect(editor.draft.bitrate).toBe(250_000);
		expect(editor.dirty).toBe(true);
		expect(server.draft.bitrate).toBe(1_000_000); // nothing overwritten

		expect(await editor.reload()).toBe(true);
		expect(editor.draft.bitrate).toBe(1_000_000);
		expect(editor.version).toBe(server.version);
		expect(editor.dirty).toBe(false);
		expect(editor.failure).toBeNull();
		expect(editor.notice).toBe('Reloaded the latest saved draft.');
		editor.change({ bitrate: 250_000 }, 'bit rate');
		expect(await editor.save()).toBe(true); // saving over the reloaded version works
	});

	it('a save failing for another reason keeps the edits and the version, and can be retried', async () => {
		const { server, editor } = setUp();
		editor.change({ bitrate: 250_000 }, 'bit rate');
		server.failNext = new Error('The server could not be reached.');
		expect(await editor.save()).toBe(false);
		expect(editor.failure).toEqual({ message: 'The server could not be reached.', stale: false });
		expect(editor.draft.bitrate).toBe(250_000);
		expect(editor.dirty).toBe(true);
		expect(editor.version).toBe(7);
		expect(editor.saving).toBe(false);
		expect(await editor.save()).toBe(true);
		expect(editor.failure).toBeNull();
		expect(server.draft.bitrate).toBe(250_000);
	});

	it('a failed reload keeps the edits and says why', async () => {
		const { editor } = setUp();
		const failing = new MapDraft(editor.view, {
			save: async () => ({ version: 1 }),
			load: async () => {
				throw new Error('That map no longer exists.');
			},
			describe: (e) => ({ message: (e as Error).message, stale: true })
		});
		failing.change({ bitrate: 250_000 }, 'bit rate');
		expect(await failing.reload()).toBe(false);
		// A failed reload is not itself a reason to offer another reload.
		expect(failing.failure).toEqual({ message: 'That map no longer exists.', stale: false });
		expect(failing.draft.bitrate).toBe(250_000);
	});

	it('undoes the last edit of any kind, one step', () => {
		const { editor } = setUp();
		const original = structuredClone(editor.draft);
		expect(editor.undoable).toBeNull();
		editor.change(renameSignal(editor.draft, 'EngineCoolant'), 'name of CoolantTemp');
		editor.change({ bitrate: 250_000 }, 'bit rate');
		expect(editor.undoable).toBe('bit rate');
		editor.undo();
		expect(editor.draft.bitrate).toBe(500_000);
		expect(editor.draft.frames[0].signals[0].name).toBe('EngineCoolant'); // the earlier edit stays
		expect(editor.undoable).toBeNull();
		editor.undo(); // only one step is kept
		expect(editor.draft.frames[0].signals[0].name).toBe('EngineCoolant');

		editor.change({ frames: [] }, 'deleted frame CoolantStatus');
		editor.undo();
		expect(editor.draft.frames).toHaveLength(1);
		editor.change(renameSignal(editor.draft, 'CoolantTemp'), 'name of EngineCoolant');
		expect(editor.draft).toEqual(original);
		expect(editor.dirty).toBe(false);
	});

	it('edits made while a save is on its way stay unsaved', async () => {
		const { server, editor } = setUp();
		editor.change({ bitrate: 250_000 }, 'bit rate');
		server.holdNext = true;
		const saving = editor.save();
		expect(editor.saving).toBe(true);
		editor.change({ bitrate: 125_000 }, 'bit rate');
		server.release();
		expect(await saving).toBe(true);
		expect(server.draft.bitrate).toBe(250_000);
		expect(editor.draft.bitrate).toBe(125_000);
		expect(editor.dirty).toBe(true);
		expect(editor.undoable).toBe('bit rate');
	});

	it('sends one save when save is called again before the first answers', async () => {
		const { server, editor } = setUp();
		editor.change({ bitrate: 250_000 }, 'bit rate');
		server.holdNext = true;
		const first = editor.save();
		const second = editor.save();
		server.release();
		expect(await Promise.all([first, second])).toEqual([true, false]);
		expect(server.saves).toHaveLength(1);
		expect(server.version).toBe(8);
		expect(editor.failure).toBeNull(); // the second call did not race into a 409
	});

	it('adopts a newer version or another map arriving by navigation, not the same or an older one', () => {
		const { server, editor } = setUp();
		editor.change({ bitrate: 250_000 }, 'bit rate');
		expect(editor.receive(server.view())).toBe(false); // same version: the edits stay
		expect(editor.draft.bitrate).toBe(250_000);
		const older = server.view();
		older.map.version = 6;
		older.map.draft = { ...older.map.draft, bitrate: 125_000 };
		expect(editor.receive(older)).toBe(false);
		expect(editor.draft.bitrate).toBe(250_000);

		server.saveElsewhere({ bitrate: 1_000_000 });
		expect(editor.receive(server.view())).toBe(true);
		expect(editor.draft.bitrate).toBe(1_000_000);
		expect(editor.version).toBe(8);
		expect(editor.dirty).toBe(false);
		expect(editor.undoable).toBeNull();

		const other = server.view('map-2');
		other.map.version = 1;
		expect(editor.receive(other)).toBe(true);
		expect(editor.view.map.id).toBe('map-2');
		expect(editor.version).toBe(1);
	});

	it('asks before leaving only when there are unsaved edits and the person may edit', () => {
		const { server, editor } = setUp();
		const ask = vi.fn(() => false);
		expect(editor.leave('link', ask)).toBe(false);
		expect(ask).not.toHaveBeenCalled();

		editor.change({ bitrate: 250_000 }, 'bit rate');
		expect(editor.leave('link', ask)).toBe(true); // "stay": cancelled, edits kept
		expect(ask).toHaveBeenCalledTimes(1);
		expect(editor.draft.bitrate).toBe(250_000);
		// Leaving the site cannot show a question of ours: cancelled, so the browser asks instead.
		expect(editor.leave('leave', ask)).toBe(true);
		expect(ask).toHaveBeenCalledTimes(1);
		// "Leave without saving": the edits are dropped.
		expect(editor.leave('goto', () => true)).toBe(false);
		expect(editor.draft.bitrate).toBe(500_000);
		expect(editor.dirty).toBe(false);

		server.role = 'viewer';
		const viewer = new MapDraft(server.view(), server.io());
		viewer.change({ bitrate: 250_000 }, 'bit rate'); // refused: nothing to lose
		expect(viewer.draft.bitrate).toBe(500_000);
		expect(viewer.leave('link', ask)).toBe(false);
		expect(ask).toHaveBeenCalledTimes(1);
	});

	it('a viewer cannot save', async () => {
		const server = new FakeServer();
		server.role = 'viewer';
		const viewer = new MapDraft(server.view(), server.io());
		expect(viewer.editable).toBe(false);
		expect(await viewer.save()).toBe(false);
		expect(server.saves).toHaveLength(0);
	});

	it('mirrors a rename done by the server without losing or saving other edits', async () => {
		const { server, editor } = setUp();
		editor.change({ bitrate: 250_000 }, 'bit rate');
		server.saveElsewhere({ name: 'Bench node v2' }); // what the rename action does
		editor.applied({ name: 'Bench node v2' }, server.version);
		expect(editor.view.map.name).toBe('Bench node v2');
		expect(editor.draft.name).toBe('Bench node v2');
		expect(editor.draft.bitrate).toBe(250_000);
		expect(editor.dirty).toBe(true);
		editor.undo(); // undoing the bit rate does not bring the old name back
		expect(editor.draft.name).toBe('Bench node v2');
		expect(editor.dirty).toBe(false);
		editor.change({ bitrate: 125_000 }, 'bit rate');
		expect(await editor.save()).toBe(true); // the renamed version is the one the server expects
		expect(server.draft).toMatchObject({ name: 'Bench node v2', bitrate: 125_000 });
	});

	it('mirrors a bit rate set by the server; the unsaved frame edit stays unsaved', async () => {
		const { server, editor } = setUp();
		const [frame] = editor.draft.frames;
		editor.change({ frames: [{ ...frame, name: 'CoolantStatus2' }] }, 'name of frame 1');
		server.saveElsewhere({ bitrate: 250_000 }); // what the bit-rate action does
		editor.applied({ bitrate: 250_000 }, server.version);
		expect(editor.draft.bitrate).toBe(250_000);
		expect(editor.draft.frames[0].name).toBe('CoolantStatus2');
		expect(editor.dirty).toBe(true);
		editor.undo(); // only the frame edit goes; the bit rate was saved on the server
		expect(editor.draft.bitrate).toBe(250_000);
		expect(editor.dirty).toBe(false);
	});

	it('takes the same version arriving again as fresh surroundings, keeping the edits', () => {
		const { server, editor } = setUp();
		editor.change({ bitrate: 250_000 }, 'bit rate');
		// A publish adds a revision but leaves the draft (and its version) as it was.
		const afterPublish = { ...server.view(), revisions: ['r1'] };
		expect(editor.receive(afterPublish)).toBe(false);
		expect(editor.view).toBe(afterPublish);
		expect(editor.draft.bitrate).toBe(250_000);
		expect(editor.dirty).toBe(true);
	});

	it('lints the working copy as it changes', () => {
		const { editor } = setUp();
		expect(editor.lint.filter((p) => p.severity === 'error')).toEqual([]);
		// Bits 56–71: an 8-byte payload has bits 0–63 only, so the field runs off its end.
		const [frame] = editor.draft.frames;
		const signals = [{ ...frame.signals[0], startBit: 56 }];
		editor.change({ frames: [{ ...frame, signals }] }, 'start bit of CoolantTemp');
		expect(editor.lint.map((p) => [p.severity, p.code])).toContainEqual([
			'error',
			'beyond-payload'
		]);
		editor.undo();
		expect(editor.lint.filter((p) => p.severity === 'error')).toEqual([]);
	});
});
