// The field-proposal routes of a capture run as the server runs them (in-memory database, temporary
// storage, the worker pool): a capture with planted fields (src/lib/can/testing/planted-csv.ts,
// invented data) whose expected answers are the planted fields and the linear relation written
// there, never output of the code under test.
import { readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { RequestEvent } from '@sveltejs/kit';
import { afterAll, describe, expect, it } from 'vitest';
import type { DecodeResponse, FrameDetail, FramesResponse } from '$lib/api/capture-views';
import type {
	AcceptedFieldsResponse,
	CorrelateResponse,
	FieldsResponse
} from '$lib/api/field-proposals';
import { canMapSchema } from '$lib/can/map';
import {
	FOLLOW,
	followerCaptureCsv,
	followerMap,
	KNOWN_ID,
	UNKNOWN_ID
} from '$lib/can/testing/planted-csv';
import { forgetCaptureDecodes } from '$lib/server/captures/decoding';
import { importCaptureInProcess } from '$lib/server/captures/processing';
import { saveDraft } from '$lib/server/maps/drafts';
import { findMapForWorkspace } from '$lib/server/maps/maps';
import type { SessionUser } from '$lib/server/guard';
import {
	createPublishedMap,
	createTeam,
	createTestServices,
	makeEvent,
	type TestServices
} from '$lib/server/test-support';
import { POST as decodeRoute } from '../../../routes/api/workspaces/[ws]/captures/[id]/decode/+server';
import { GET as framesRoute } from '../../../routes/api/workspaces/[ws]/captures/[id]/frames/+server';
import { GET as frameRoute } from '../../../routes/api/workspaces/[ws]/captures/[id]/frames/[index]/+server';
import { GET as storedDecodeRoute } from '../../../routes/api/workspaces/[ws]/captures/[id]/decodes/[decodeId]/+server';
import { GET as fieldsRoute } from '../../../routes/api/workspaces/[ws]/captures/[id]/fields/+server';
import { POST as acceptRoute } from '../../../routes/api/workspaces/[ws]/captures/[id]/fields/accept/+server';
import { GET as correlateRoute } from '../../../routes/api/workspaces/[ws]/captures/[id]/fields/correlate/+server';

const map = canMapSchema.parse(followerMap);
const worlds: TestServices[] = [];
afterAll(() => worlds.forEach((s) => rmSync(s.storageRoot, { recursive: true, force: true })));

const API = '/api/workspaces/[ws]/captures/[id]';

async function buildWorld() {
	const services = await createTestServices();
	worlds.push(services);
	const { workspace: ws, users } = await createTeam(services.db, 'Fields team');
	const mapId = await createPublishedMap(services.db, {
		workspaceId: ws.id,
		actorId: users.owner.id,
		revisions: [map]
	});
	const captureId = await importCaptureInProcess(services, {
		workspaceId: ws.id,
		actorId: users.editor.id,
		fileName: 'planted.csv',
		text: followerCaptureCsv(1500)
	});
	const w = { services, slug: ws.slug, workspaceId: ws.id, mapId, captureId, ...users };
	const decoded = await jsonOf<DecodeResponse>(
		await decodeRoute(
			event(w, users.viewer, '/decode', { body: { mapId, revision: 'draft' } }) as never
		)
	);
	return { ...w, decodeId: decoded.decode.id, decoded };
}
type World = Awaited<ReturnType<typeof buildWorld>>;

function event(
	w: { services: TestServices; slug: string; captureId: string },
	user: SessionUser | null,
	route: string,
	init: { query?: string; body?: unknown; params?: Record<string, string> } = {}
) {
	const routeId = `${API}${route}`;
	const params = { ws: w.slug, id: w.captureId, ...init.params };
	return makeEvent<RequestEvent>({
		services: w.services,
		user,
		routeId,
		params,
		query: init.query,
		body: init.body
	}) as never;
}

async function jsonOf<T>(response: Response, status = 200): Promise<T> {
	const body = await response.json();
	expect(response.status, JSON.stringify(body)).toBe(status);
	return body as T;
}

const getFields = (w: World, user: SessionUser, query: string) =>
	fieldsRoute(event(w, user, '/fields', { query }));

let shared: Promise<World> | null = null;
const world = () => (shared ??= buildWorld());

describe('field proposals of a capture', () => {
	it('proposes the planted counter, checksum, constant and value of the unknown ID, viewers included', async () => {
		const w = await world();
		const answer = await jsonOf<FieldsResponse>(
			await getFields(w, w.viewer, `?decode=${w.decodeId}`)
		);
		expect(answer.draft).toMatchObject({ mapId: w.mapId, mapName: map.name });
		// Only the unknown ID: the known one is defined by the map.
		expect(answer.ids.map((i) => i.id)).toEqual([UNKNOWN_ID]);
		const fields = answer.ids[0].fields;
		expect(fields).toContainEqual(
			expect.objectContaining({ kind: 'counter', startBit: 48, length: 4, step: 1 })
		);
		expect(fields).toContainEqual(
			expect.objectContaining({
				kind: 'checksum',
				startBit: 56,
				length: 8,
				algorithm: 'crc8-sae-j1850'
			})
		);
		expect(fields).toContainEqual(
			expect.objectContaining({ kind: 'constant', startBit: 32, length: 8, value: 0x5a })
		);
		expect(fields).toContainEqual(
			expect.objectContaining({ kind: 'value', startBit: 8, length: 16, byteOrder: 'little' })
		);
		// One ID by hex; the same answer again (cached).
		const one = await jsonOf<FieldsResponse>(
			await getFields(w, w.viewer, `?decode=${w.decodeId}&id=3A1&extended=0`)
		);
		expect(one.ids).toEqual(answer.ids);
	});

	it('refuses bad input with the parameter named, and IDs that are not unknown', async () => {
		const w = await world();
		const bad = await jsonOf<{ issues: { path: string }[] }>(
			await getFields(w, w.viewer, `?decode=${w.decodeId}&id=zz`),
			400
		);
		expect(bad.issues.map((i) => i.path)).toEqual(['id']);
		await jsonOf(await getFields(w, w.viewer, `?decode=${w.decodeId}&id=120`), 404);
		await jsonOf(await getFields(w, w.viewer, `?decode=nope`), 404);
		await jsonOf(await getFields(w, w.outsider, `?decode=${w.decodeId}`), 404);
	});

	it('finds the field that follows the known channel, with its scale and offset', async () => {
		const w = await world();
		const channel = w.decoded.summary.channels.find((c) => c.signalName === 'ShaftSpeed')!;
		const answer = await jsonOf<CorrelateResponse>(
			await correlateRoute(
				event(w, w.viewer, '/fields/correlate', {
					query: `?decode=${w.decodeId}&channel=${channel.index}&points=200`
				})
			)
		);
		const best = answer.ranking[0];
		expect(best).toMatchObject({ id: UNKNOWN_ID, startBit: 8, length: 16, byteOrder: 'little' });
		// The known frame shares its twin's time, so the relation is exact up to rounding.
		expect(best.pearson).toBeCloseTo(1, 9);
		expect(best.scale! / FOLLOW.scale).toBeCloseTo(1, 6);
		expect(best.offset! - FOLLOW.offset).toBeCloseTo(0, 4);
		expect(answer.scatter.raw.length).toBeLessThanOrEqual(200);
		expect(answer.scatter.raw.length).toBe(answer.scatter.channel.length);
		answer.scatter.raw.forEach((raw, k) =>
			expect(answer.scatter.channel[k]).toBeCloseTo(raw * FOLLOW.scale + FOLLOW.offset, 6)
		);
		await jsonOf(
			await correlateRoute(
				event(w, w.viewer, '/fields/correlate', { query: `?decode=${w.decodeId}&channel=99` })
			),
			404
		);
		const bad = await jsonOf<{ issues: { path: string }[] }>(
			await correlateRoute(
				event(w, w.viewer, '/fields/correlate', {
					query: `?decode=${w.decodeId}&channel=0&points=1`
				})
			),
			400
		);
		expect(bad.issues.map((i) => i.path)).toEqual(['points']);
	});
});

describe('accepting proposals into the draft', () => {
	const signals = [
		{ name: 'Follower', startBit: 8, length: 16, scale: 0.5, offset: 25, unit: 'rpm' },
		{ name: 'Alive', startBit: 48, length: 4, role: 'counter', comment: 'counter step 1' },
		{ name: 'Crc', startBit: 56, length: 8, role: 'checksum', comment: 'CRC-8 SAE J1850' }
	];

	it('refuses viewers, bad bodies and a stale draft version, then adds the frame with its roles', async () => {
		const w = await buildWorld();
		const before = (await findMapForWorkspace(w.services.db, w.workspaceId, w.mapId))!;
		const body = {
			decode: w.decodeId,
			version: before.version,
			id: UNKNOWN_ID,
			extended: false,
			signals
		};
		const accept = (user: SessionUser, b: unknown) =>
			acceptRoute(event(w, user, '/fields/accept', { body: b }));
		await jsonOf(await accept(w.viewer, body), 403);
		const bad = await jsonOf<{ issues: { path: string }[] }>(
			await accept(w.editor, {
				...body,
				signals: [signals[0], { ...signals[1], name: 'Follower' }]
			}),
			400
		);
		expect(bad.issues.map((i) => i.path)).toEqual(['signals']);
		const empty = await jsonOf<{ issues: { path: string }[] }>(
			await accept(w.editor, { ...body, signals: [] }),
			400
		);
		expect(empty.issues.map((i) => i.path)).toEqual(['signals']);

		// Someone else saves the draft in the meantime: the accept names the change and writes nothing.
		const { version: theirs } = await saveDraft(w.services.db, {
			workspaceId: w.workspaceId,
			mapId: w.mapId,
			version: before.version,
			draft: { ...before.draft, name: `${before.draft.name} (edited)` },
			actorId: w.owner.id
		});
		const stale = await jsonOf<{ error: string; currentVersion: number }>(
			await accept(w.editor, body),
			409
		);
		expect(stale.currentVersion).toBe(theirs);
		expect(stale.error).toMatch(/changed by .* since you loaded it/);
		expect(
			(await findMapForWorkspace(w.services.db, w.workspaceId, w.mapId))!.draft.frames
		).toHaveLength(1);

		const done = await jsonOf<AcceptedFieldsResponse>(
			await accept(w.editor, { ...body, version: theirs })
		);
		expect(done).toMatchObject({ mapId: w.mapId, version: theirs + 1, frameIndex: 1, lint: [] });
		const after = (await findMapForWorkspace(w.services.db, w.workspaceId, w.mapId))!;
		const frame = after.draft.frames[1];
		expect(frame).toMatchObject({ name: 'Undocumented_0x3A1', id: UNKNOWN_ID, length: 8 });
		expect(frame.signals.map((s) => [s.name, s.role, s.scale, s.offset])).toEqual([
			['Follower', 'value', 0.5, 25],
			['Alive', 'counter', 1, 0],
			['Crc', 'checksum', 1, 0]
		]);
		expect(frame.signals[2].comment).toBe('CRC-8 SAE J1850');

		// The ID is defined now: a second accept is refused (409 naming the frame).
		await jsonOf(await accept(w.editor, { ...body, version: after.version }), 409);

		// Decoding again with the draft gives the new channels; the follower reads as the known one.
		const again = await jsonOf<DecodeResponse>(
			await decodeRoute(
				event(w, w.editor, '/decode', { body: { mapId: w.mapId, revision: 'draft' } })
			)
		);
		const names = again.summary.channels.map((c) => c.signalName);
		expect(names).toEqual(expect.arrayContaining(['ShaftSpeed', 'Follower', 'Alive', 'Crc']));
		expect(again.summary.unknownIds.map((u) => u.id)).not.toContain(UNKNOWN_ID);
		const known = again.summary.channels.find((c) => c.signalName === 'ShaftSpeed')!;
		const follower = again.summary.channels.find((c) => c.signalName === 'Follower')!;
		expect(follower.min).toBeCloseTo(known.min!, 6);
		expect(follower.max).toBeCloseTo(known.max!, 6);
		expect(KNOWN_ID).not.toBe(UNKNOWN_ID);

		// The decode carries each channel's role from the map (docs/map-format.md, "Signal roles").
		const roles = Object.fromEntries(again.summary.channels.map((c) => [c.signalName, c.role]));
		expect(roles).toMatchObject({
			ShaftSpeed: 'value',
			Follower: 'value',
			Alive: 'counter',
			Crc: 'checksum'
		});

		// So does one frame's decoded signals (the frame detail view marks them).
		const page = await jsonOf<FramesResponse>(
			await framesRoute(
				event(w, w.viewer, '/frames', { query: `?id=${UNKNOWN_ID.toString(16)}&limit=1` })
			)
		);
		const detail = await jsonOf<FrameDetail>(
			await frameRoute(
				event(w, w.viewer, '/frames/[index]', {
					params: { index: String(page.frames[0].index) },
					query: `?decode=${again.decode.id}`
				})
			)
		);
		expect(detail.signals.map((s) => [s.name, s.role])).toEqual([
			['Follower', 'value'],
			['Alive', 'counter'],
			['Crc', 'checksum']
		]);

		// A summary stored before roles existed (no `role` in its channels) still reads: every
		// channel a value.
		const summaries = readdirSync(w.services.storageRoot, { recursive: true, encoding: 'utf8' })
			.filter((f) => f.endsWith('summary.json'))
			.map((f) => join(w.services.storageRoot, f));
		expect(summaries.length).toBeGreaterThan(0);
		for (const file of summaries) {
			const stored = JSON.parse(readFileSync(file, 'utf8'));
			for (const c of stored.summary.channels) delete c.role;
			writeFileSync(file, JSON.stringify(stored));
		}
		forgetCaptureDecodes(w.captureId);
		const old = await jsonOf<DecodeResponse>(
			await storedDecodeRoute(
				event(w, w.viewer, '/decodes/[decodeId]', { params: { decodeId: again.decode.id } })
			)
		);
		expect(old.summary.channels.map((c) => c.signalName)).toEqual(
			again.summary.channels.map((c) => c.signalName)
		);
		expect(new Set(old.summary.channels.map((c) => c.role))).toEqual(new Set(['value']));
	});

	it('lists the workspace’s map drafts and accepts into another map than the decode’s', async () => {
		const w = await buildWorld();
		const otherId = await createPublishedMap(w.services.db, {
			workspaceId: w.workspaceId,
			actorId: w.owner.id,
			revisions: [{ ...map, name: 'Another map', frames: [] }]
		});
		const other = (await findMapForWorkspace(w.services.db, w.workspaceId, otherId))!;
		const answer = await jsonOf<FieldsResponse>(
			await getFields(w, w.editor, `?decode=${w.decodeId}&id=${UNKNOWN_ID.toString(16)}`)
		);
		expect(answer.draft.mapId).toBe(w.mapId);
		expect(answer.drafts.map((d) => [d.mapId, d.mapName, d.version])).toEqual(
			expect.arrayContaining([
				[w.mapId, answer.draft.mapName, answer.draft.version],
				[otherId, 'Another map', other.version]
			])
		);
		expect(answer.drafts).toHaveLength(2);
		const done = await jsonOf<AcceptedFieldsResponse>(
			await acceptRoute(
				event(w, w.editor, '/fields/accept', {
					body: {
						decode: w.decodeId,
						mapId: otherId,
						version: other.version,
						id: UNKNOWN_ID,
						extended: false,
						signals
					}
				})
			)
		);
		expect(done).toMatchObject({ mapId: otherId, version: other.version + 1, frameIndex: 0 });
		const after = (await findMapForWorkspace(w.services.db, w.workspaceId, otherId))!;
		expect(after.draft.frames.map((f) => f.id)).toEqual([UNKNOWN_ID]);
		// The decode's own map is untouched.
		expect(
			(await findMapForWorkspace(w.services.db, w.workspaceId, w.mapId))!.draft.frames
		).toHaveLength(1);
	});
});
