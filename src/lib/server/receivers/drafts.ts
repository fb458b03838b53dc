/**
 * Changes to a profile's draft, on the versioning shared with maps (`../versioning/drafts.ts`):
 * each names the draft version it was made on, a stale one is refused with a 409, and each is
 * audited with the change. A draft is checked whole before anything is written: every link must
 * name a signal its map revision has, with the conversion the units need — a bad link refuses
 * the save (400, by path) and nothing of it is stored.
 */
import type { ProfileDraft, ProfileDraftSavedResponse } from '../../api/receivers';
import type { DB } from '../db/connection';
import { Problem } from '../problem';
import { replaceDraft, type DraftStore } from '../versioning/drafts';
import { linkIssues, loadTargetOf, workspaceMatcher } from './links';
import { draftColumns, requireProfile, type ProfileRecord } from './profiles';

/** How profiles keep their draft: the profile JSON, its links and target in the row. */
export const profileDrafts: DraftStore<ProfileRecord, ProfileDraft> = {
	noun: 'receiver profile',
	require: requireProfile,
	async write(db, change) {
		const result = await db
			.updateTable('receiver_profiles')
			.set({
				...draftColumns(change.draft),
				draft_version: change.next,
				updated_by: change.actorId,
				updated_at: change.at
			})
			.where('id', '=', change.id)
			.where('draft_version', '=', change.expected)
			.executeTakeFirst();
		return Number(result.numUpdatedRows) === 1;
	}
};

/** Every reason the links of a draft cannot be stored, as a 400 (nothing is written). */
export async function checkDraftLinks(
	db: DB,
	workspaceId: string,
	draft: ProfileDraft,
	prefix = 'draft'
): Promise<void> {
	if (!draft.target) return;
	const target = await loadTargetOf(db, workspaceId, draft.target, `${prefix}.target`);
	const issues = linkIssues(
		draft.profile,
		target,
		draft.links,
		`${prefix}.links`,
		await workspaceMatcher(db, workspaceId)
	);
	if (issues.length > 0)
		throw new Problem(
			400,
			`${issues.length} link${issues.length === 1 ? '' : 's'} cannot be stored as ${issues.length === 1 ? 'it is' : 'they are'}; nothing was saved.`,
			issues
		);
}

export async function saveProfileDraft(
	db: DB,
	input: {
		workspaceId: string;
		profileId: string;
		version: number;
		draft: ProfileDraft;
		actorId: string;
	}
): Promise<ProfileDraftSavedResponse> {
	await requireProfile(db, input.workspaceId, input.profileId);
	await checkDraftLinks(db, input.workspaceId, input.draft);
	return replaceDraft(db, profileDrafts, {
		workspaceId: input.workspaceId,
		id: input.profileId,
		version: input.version,
		draft: input.draft,
		actorId: input.actorId,
		action: 'receiver.draft.save',
		details: {
			wanted: input.draft.profile.wanted.length,
			links: input.draft.links.length,
			map: input.draft.target
		}
	});
}
