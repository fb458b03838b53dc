/**
 * Repository of captures and their decode records. Functions take `db` (or a transaction) first;
 * a capture of another workspace is as unknown as a missing one.
 */
import type { z } from 'zod';
import {
	captureReportSchema,
	detectedLayoutSchema,
	type CaptureDetail,
	type CaptureStatusResponse,
	type CaptureSummary,
	type DecodeRecord,
	type DetectedLayout
} from '../../api/captures';
import { captureLayoutSchema, type CaptureLayout } from '../../can/capture/layout';
import type { DB } from '../db/connection';
import type { CaptureRow, CaptureUpdate } from '../db/schema';
import { personRef } from '../people';
import { Problem } from '../problem';
import { captureBitrate } from './bitrate';

function summaryQuery(db: DB) {
	return db
		.selectFrom('captures')
		.leftJoin('User', 'User.id', 'captures.uploaded_by')
		.selectAll('captures')
		.select(['User.email as uploaderEmail', 'User.name as uploaderName']);
}

function decodeQuery(db: DB) {
	return db
		.selectFrom('capture_decodes')
		.leftJoin('User', 'User.id', 'capture_decodes.decoded_by')
		.selectAll('capture_decodes')
		.select(['User.email as decoderEmail', 'User.name as decoderName']);
}

type DecodeJoined = Awaited<ReturnType<ReturnType<typeof decodeQuery>['executeTakeFirstOrThrow']>>;
type SummaryJoined = Awaited<
	ReturnType<ReturnType<typeof summaryQuery>['executeTakeFirstOrThrow']>
>;

function toDecodeRecord(row: DecodeJoined): DecodeRecord {
	return {
		id: row.id,
		mapId: row.map_id,
		mapName: row.map_name,
		revision: row.revision,
		draftVersion: row.draft_version,
		decodedAt: row.decoded_at,
		decodedBy: personRef(row.decoderEmail, row.decoderName),
		bus: row.bus
	};
}

function toSummary(row: SummaryJoined, last: DecodeRecord | undefined): CaptureSummary {
	return {
		id: row.id,
		name: row.name,
		fileName: row.file_name,
		sizeBytes: row.size_bytes,
		uploadedAt: row.uploaded_at,
		uploadedBy: personRef(row.uploaderEmail, row.uploaderName),
		status: row.status,
		progress: row.progress,
		frameCount: row.frame_count,
		durationS: row.duration_s,
		error: row.error,
		lastDecode: last
			? {
					id: last.id,
					mapId: last.mapId,
					mapName: last.mapName,
					revision: last.revision,
					decodedAt: last.decodedAt
				}
			: null
	};
}

/** Stored JSON is written by this module; a parse failure means the row was altered by hand. */
function readStored<S extends z.ZodType>(
	schema: S,
	text: string | null,
	what: string
): z.infer<S> | null {
	if (text === null) return null;
	const parsed = schema.safeParse(JSON.parse(text));
	if (!parsed.success)
		throw new Error(`Stored ${what} is not valid: ${parsed.error.issues[0]?.message}`);
	return parsed.data;
}

/** The newest decode of each of the given captures. */
async function latestDecodes(db: DB, captureIds: string[]): Promise<Map<string, DecodeRecord>> {
	const latest = new Map<string, DecodeRecord>();
	if (captureIds.length === 0) return latest;
	const rows = await decodeQuery(db)
		.where('capture_decodes.capture_id', 'in', captureIds)
		.orderBy('capture_decodes.decoded_at', 'desc')
		.orderBy('capture_decodes.id')
		.execute();
	for (const row of rows)
		if (!latest.has(row.capture_id)) latest.set(row.capture_id, toDecodeRecord(row));
	return latest;
}

/** Newest upload first. */
export async function listCaptures(db: DB, workspaceId: string): Promise<CaptureSummary[]> {
	const rows = await summaryQuery(db)
		.where('captures.workspace_id', '=', workspaceId)
		.orderBy('captures.uploaded_at', 'desc')
		.orderBy('captures.name')
		.execute();
	const latest = await latestDecodes(
		db,
		rows.map((r) => r.id)
	);
	return rows.map((r) => toSummary(r, latest.get(r.id)));
}

/** The raw row (storage keys included) if the capture belongs to the workspace. */
export async function findCaptureRow(
	db: DB,
	workspaceId: string,
	captureId: string
): Promise<CaptureRow | undefined> {
	return db
		.selectFrom('captures')
		.selectAll()
		.where('id', '=', captureId)
		.where('workspace_id', '=', workspaceId)
		.executeTakeFirst();
}

export async function requireCaptureRow(
	db: DB,
	workspaceId: string,
	captureId: string
): Promise<CaptureRow> {
	const row = await findCaptureRow(db, workspaceId, captureId);
	if (!row) throw new Problem(404, 'Capture not found.');
	return row;
}

/** Processing status and progress, for polling. */
export async function captureStatus(
	db: DB,
	workspaceId: string,
	captureId: string
): Promise<CaptureStatusResponse> {
	const row = await requireCaptureRow(db, workspaceId, captureId);
	return { status: row.status, progress: row.progress, error: row.error };
}

async function findCaptureSummary(
	db: DB,
	workspaceId: string,
	captureId: string
): Promise<CaptureSummary | undefined> {
	const row = await summaryQuery(db)
		.where('captures.id', '=', captureId)
		.where('captures.workspace_id', '=', workspaceId)
		.executeTakeFirst();
	if (!row) return undefined;
	return toSummary(row, (await latestDecodes(db, [row.id])).get(row.id));
}

export async function requireCaptureSummary(
	db: DB,
	workspaceId: string,
	captureId: string
): Promise<CaptureSummary> {
	const summary = await findCaptureSummary(db, workspaceId, captureId);
	if (!summary) throw new Problem(404, 'Capture not found.');
	return summary;
}

/** Newest first. */
async function listDecodes(db: DB, captureId: string): Promise<DecodeRecord[]> {
	const rows = await decodeQuery(db)
		.where('capture_decodes.capture_id', '=', captureId)
		.orderBy('capture_decodes.decoded_at', 'desc')
		.orderBy('capture_decodes.id')
		.execute();
	return rows.map(toDecodeRecord);
}

export async function findDecode(
	db: DB,
	captureId: string,
	decodeId: string
): Promise<DecodeRecord | undefined> {
	const row = await decodeQuery(db)
		.where('capture_decodes.capture_id', '=', captureId)
		.where('capture_decodes.id', '=', decodeId)
		.executeTakeFirst();
	return row ? toDecodeRecord(row) : undefined;
}

export interface NewDecode {
	captureId: string;
	mapId: string;
	mapName: string;
	revision: number | null;
	draftVersion: number | null;
	actorId: string | null;
	/** One bus of several, or null for every bus. */
	bus?: number | null;
}

export async function insertDecode(db: DB, input: NewDecode): Promise<DecodeRecord> {
	const id = crypto.randomUUID();
	await db
		.insertInto('capture_decodes')
		.values({
			id,
			capture_id: input.captureId,
			map_id: input.mapId,
			map_name: input.mapName,
			revision: input.revision,
			draft_version: input.draftVersion,
			decoded_by: input.actorId,
			decoded_at: new Date().toISOString(),
			bus: input.bus ?? null
		})
		.execute();
	return (await findDecode(db, input.captureId, id))!;
}

export async function captureDetail(
	db: DB,
	workspaceId: string,
	captureId: string
): Promise<CaptureDetail> {
	const row = await requireCaptureRow(db, workspaceId, captureId);
	return {
		capture: await requireCaptureSummary(db, workspaceId, captureId),
		detected: readStored(detectedLayoutSchema, row.detected_json, 'detected layout'),
		layout: readStored(captureLayoutSchema, row.layout_json, 'capture layout'),
		report: readStored(captureReportSchema, row.report_json, 'import report'),
		decodes: await listDecodes(db, captureId),
		bitrate: await captureBitrate(db, row)
	};
}

/**
 * A new capture row for a file just stored at `rawKey`: 'uploaded' while its layout awaits
 * confirmation, or 'processing' when it is parsed at once with `layout`.
 */
export async function insertCapture(
	db: DB,
	input: {
		id: string;
		workspaceId: string;
		fileName: string;
		sizeBytes: number;
		actorId: string | null;
		rawKey: string;
		detected: DetectedLayout;
		layout: CaptureLayout | null;
	}
): Promise<void> {
	await db
		.insertInto('captures')
		.values({
			id: input.id,
			workspace_id: input.workspaceId,
			name: input.fileName,
			file_name: input.fileName,
			size_bytes: input.sizeBytes,
			uploaded_by: input.actorId,
			uploaded_at: new Date().toISOString(),
			status: input.layout ? 'processing' : 'uploaded',
			detected_json: JSON.stringify(input.detected),
			layout_json: input.layout ? JSON.stringify(input.layout) : null,
			report_json: null,
			frame_count: null,
			duration_s: null,
			raw_key: input.rawKey,
			store_key: null,
			error: null,
			processed_at: null
		})
		.execute();
}

export async function updateCapture(
	db: DB,
	captureId: string,
	patch: CaptureUpdate
): Promise<void> {
	await db.updateTable('captures').set(patch).where('id', '=', captureId).execute();
}

export async function deleteCaptureRow(db: DB, captureId: string): Promise<void> {
	await db.deleteFrom('captures').where('id', '=', captureId).execute();
}
