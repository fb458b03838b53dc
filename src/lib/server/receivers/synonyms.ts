/**
 * A workspace's own synonyms for linking: abbreviations, unit words and synonym groups in the
 * shape of the built-in table (src/lib/can/receivers/synonyms.json), merged into it when linking.
 * A group with a known id gains names; a new id adds a group (docs/receivers.md).
 */
import { synonymTableSchema, type SynonymTable } from '../../can/receivers/names';
import { parseJsonDocument } from '../../can/map-json';
import type { DB } from '../db/connection';
import { Problem } from '../problem';
import { appendAudit } from '../workspaces/audit';

/** The workspace's additions, or undefined when it has none. */
export async function workspaceSynonyms(
	db: DB,
	workspaceId: string
): Promise<SynonymTable | undefined> {
	const row = await db
		.selectFrom('receiver_synonyms')
		.select('synonyms_json')
		.where('workspace_id', '=', workspaceId)
		.executeTakeFirst();
	if (!row) return undefined;
	const parsed = synonymTableSchema.safeParse(JSON.parse(row.synonyms_json));
	if (!parsed.success) throw new Error(`Stored synonyms of workspace ${workspaceId} are not valid`);
	return parsed.data;
}

/** The additions as the page shows them for editing: pretty JSON, or an empty skeleton. */
export async function workspaceSynonymsText(db: DB, workspaceId: string): Promise<string> {
	const table = await workspaceSynonyms(db, workspaceId);
	return JSON.stringify(table ?? { abbreviations: {}, unitWords: [], concepts: [] }, null, 2);
}

/**
 * Replaces the workspace's additions with `text` (JSON in the synonyms.json shape). Every problem
 * is reported by JSON path and nothing is stored while one remains.
 */
export async function saveWorkspaceSynonyms(
	db: DB,
	input: { workspaceId: string; actorId: string; text: string }
): Promise<SynonymTable> {
	const parsed = parseJsonDocument(input.text, synonymTableSchema, 'synonyms');
	if (!parsed.ok)
		throw new Problem(
			400,
			`The synonyms have ${parsed.problems.length} problem${parsed.problems.length === 1 ? '' : 's'}; nothing was saved.`,
			parsed.problems.map((p) => ({ ...p, path: p.path || '(root)' }))
		);
	const now = new Date().toISOString();
	await db.transaction().execute(async (trx) => {
		await trx
			.insertInto('receiver_synonyms')
			.values({
				workspace_id: input.workspaceId,
				synonyms_json: JSON.stringify(parsed.value),
				updated_by: input.actorId,
				updated_at: now
			})
			.onConflict((oc) =>
				oc.column('workspace_id').doUpdateSet({
					synonyms_json: JSON.stringify(parsed.value),
					updated_by: input.actorId,
					updated_at: now
				})
			)
			.execute();
		await appendAudit(trx, {
			workspaceId: input.workspaceId,
			actorId: input.actorId,
			action: 'receiver.synonyms.save',
			target: input.workspaceId,
			details: {
				abbreviations: Object.keys(parsed.value.abbreviations).length,
				unitWords: parsed.value.unitWords.length,
				concepts: parsed.value.concepts.length
			}
		});
	});
	return parsed.value;
}
