import type { ColumnType, Generated, Insertable, Selectable, Updateable } from 'kysely';
import type { CaptureStatus } from '../../api/captures';
import type { Role } from '../../roles';

// Types mirror what better-sqlite3 returns: timestamps as ISO text (or epoch ms where noted),
// booleans would be 0/1. Columns the database fills are Generated<>.

export interface UserTable {
	id: string;
	name: string | null;
	email: string;
	emailVerified: string | null;
	image: string | null;
}

export interface AccountTable {
	id: Generated<number>;
	userId: string;
	type: string;
	provider: string;
	providerAccountId: string;
	refresh_token: string | null;
	access_token: string | null;
	expires_at: number | null;
	token_type: string | null;
	scope: string | null;
	id_token: string | null;
	session_state: string | null;
}

export interface SessionTable {
	id: Generated<number>;
	sessionToken: string;
	userId: string;
	expires: string;
}

export interface VerificationTokenTable {
	identifier: string;
	token: string;
	expires: string;
}

export interface WorkspaceTable {
	id: string;
	slug: string;
	name: string;
	created_by: string | null;
	created_at: string;
}

export interface MembershipTable {
	workspace_id: string;
	user_id: string;
	role: Role;
	joined_at: string;
}

export interface InvitationTable {
	id: string;
	workspace_id: string;
	email: string;
	role: Role;
	token_hash: string;
	invited_by: string | null;
	created_at: string;
	expires_at: string;
	accepted_at: string | null;
	accepted_by: string | null;
}

export interface AuditLogTable {
	id: Generated<number>;
	workspace_id: string | null;
	actor_id: string | null;
	action: string;
	target: string | null;
	/** JSON text. */
	details: ColumnType<string, string | undefined, string>;
	created_at: string;
	/** The access token the change was made with; null for a signed-in session. */
	token_id: ColumnType<string | null, string | null | undefined, string | null>;
}

export interface SigninRequestTable {
	id: Generated<number>;
	email: string;
	/** Epoch milliseconds. */
	requested_at: number;
}

export interface MailboxMessageTable {
	id: string;
	to_address: string;
	from_address: string;
	subject: string;
	text: string;
	html: string | null;
	/** JSON array of URLs found in the message. */
	links: ColumnType<string, string | undefined, string>;
	received_at: string;
}

export interface MapTable {
	id: string;
	workspace_id: string;
	name: string;
	/** The draft as `framewright-map@1` JSON text. */
	draft_json: string;
	/** Bumped by every change to the draft; a save must name the version it started from. */
	draft_version: number;
	created_by: string | null;
	created_at: string;
	updated_by: string | null;
	updated_at: string;
}

export interface MapRevisionTable {
	id: string;
	map_id: string;
	/** 1, 2, … per map (shown as r1, r2, …). */
	number: number;
	note: string;
	/** The published map as `framewright-map@1` JSON text; never changed after insert. */
	map_json: string;
	published_by: string | null;
	published_at: string;
	/** The draft version it was published from (unique per map); null for a few older revisions. */
	draft_version: number | null;
}

export interface ShareLinkTable {
	id: string;
	map_id: string;
	revision_id: string;
	token_hash: string;
	created_by: string | null;
	created_at: string;
	expires_at: string | null;
	revoked_at: string | null;
}

export interface CaptureTable {
	id: string;
	workspace_id: string;
	/** What people call it (the file name unless renamed). */
	name: string;
	file_name: string;
	size_bytes: number;
	uploaded_by: string | null;
	uploaded_at: string;
	status: CaptureStatus;
	/** JSON `{ layout, notes, sampleRows }`: the importer's guess from the first bytes. */
	detected_json: string | null;
	/** JSON CaptureLayout the capture was (or is being) processed with. */
	layout_json: string | null;
	/** JSON import report (frame and line counts, bad rows, warnings). */
	report_json: string | null;
	frame_count: number | null;
	duration_s: number | null;
	/** Storage key of the uploaded CSV. */
	raw_key: string;
	/** Storage key of the compact FrameStore bytes, once processed. */
	store_key: string | null;
	/** 0…1 while processing (bytes read / size). */
	progress: Generated<number>;
	error: string | null;
	processed_at: string | null;
	/** The capture's own bit rate (bit/s) for bus load and timing; null until guessed or set. */
	bitrate: number | null;
	/** Data-phase bit rate of CAN FD frames (bit/s); null: FD frames at the nominal rate. */
	data_bitrate: number | null;
	/** Name of the map the bit rate was guessed from; null once a person set it. */
	bitrate_guess: string | null;
}

export interface CaptureDecodeTable {
	id: string;
	capture_id: string;
	/** null once the map is deleted; `map_name` keeps what it was called. */
	map_id: string | null;
	map_name: string;
	/** Revision number, or null for the draft (then `draft_version` says which). */
	revision: number | null;
	draft_version: number | null;
	decoded_by: string | null;
	decoded_at: string;
	/** The one bus decoded (index into the capture's bus names); null: every bus. */
	bus: number | null;
}

export interface AccessTokenTable {
	/** The public part of the token (`fwt_<id>_<secret>`): finds the row. */
	id: string;
	workspace_id: string;
	user_id: string;
	name: string;
	/** At most the person's role when it was made; read-only tokens are viewer, edit tokens editor. */
	role: Role;
	/** SHA-256 (hex) of the secret part; the secret itself is shown once and never stored. */
	secret_hash: string;
	created_at: string;
	expires_at: string;
	/** Updated at most once a minute. */
	last_used_at: string | null;
	revoked_at: string | null;
}

export interface ReceiverProfileTable {
	id: string;
	workspace_id: string;
	/** Mirrors the draft's name, for lists. */
	name: string;
	kind: string;
	/** The draft as `framewright-profile@1` JSON text. */
	draft_json: string;
	/** The draft's links (JSON array of links, each with its conversion). */
	links_json: ColumnType<string, string | undefined, string>;
	/** The map revision the links point at; null before linking (map_id null also once the map is deleted). */
	map_id: string | null;
	map_revision: number | null;
	/** Bumped by every change to the draft; a save must name the version it started from. */
	draft_version: number;
	created_by: string | null;
	created_at: string;
	updated_by: string | null;
	updated_at: string;
}

export interface ReceiverProfileRevisionTable {
	id: string;
	profile_id: string;
	/** 1, 2, … per profile (shown as r1, r2, …). */
	number: number;
	note: string;
	/** The published profile as `framewright-profile@1` JSON text; never changed after insert. */
	profile_json: string;
	links_json: string;
	map_id: string | null;
	/** The linked map's name when published, kept if the map is deleted. */
	map_name: string | null;
	map_revision: number | null;
	published_by: string | null;
	published_at: string;
}

export interface ReceiverSynonymsTable {
	workspace_id: string;
	/** The workspace's additions to the built-in synonyms (JSON, the synonyms.json shape). */
	synonyms_json: string;
	updated_by: string | null;
	updated_at: string;
}

/** A saved view of a capture's workbench (its state as JSON, `src/lib/api/workbench.ts`). */
export interface CaptureViewTable {
	id: string;
	capture_id: string;
	name: string;
	state_json: string;
	/** null once the author's account is gone. */
	saved_by: string | null;
	saved_at: string;
}

export interface Database {
	User: UserTable;
	Account: AccountTable;
	Session: SessionTable;
	VerificationToken: VerificationTokenTable;
	workspaces: WorkspaceTable;
	memberships: MembershipTable;
	invitations: InvitationTable;
	audit_log: AuditLogTable;
	signin_requests: SigninRequestTable;
	mailbox_messages: MailboxMessageTable;
	maps: MapTable;
	map_revisions: MapRevisionTable;
	share_links: ShareLinkTable;
	captures: CaptureTable;
	capture_decodes: CaptureDecodeTable;
	access_tokens: AccessTokenTable;
	receiver_profiles: ReceiverProfileTable;
	receiver_profile_revisions: ReceiverProfileRevisionTable;
	receiver_synonyms: ReceiverSynonymsTable;
	capture_views: CaptureViewTable;
}

export type User = Selectable<UserTable>;
export type Workspace = Selectable<WorkspaceTable>;
export type NewWorkspace = Insertable<WorkspaceTable>;
export type WorkspaceUpdate = Updateable<WorkspaceTable>;
export type Membership = Selectable<MembershipTable>;
export type NewMembership = Insertable<MembershipTable>;
export type Invitation = Selectable<InvitationTable>;
export type NewInvitation = Insertable<InvitationTable>;
export type AuditLogEntry = Selectable<AuditLogTable>;
export type NewAuditLogEntry = Insertable<AuditLogTable>;
export type MailboxMessage = Selectable<MailboxMessageTable>;
export type NewMailboxMessage = Insertable<MailboxMessageTable>;
export type MapRow = Selectable<MapTable>;
export type MapRevisionRow = Selectable<MapRevisionTable>;
export type ShareLinkRow = Selectable<ShareLinkTable>;
export type CaptureRow = Selectable<CaptureTable>;
export type NewCaptureRow = Insertable<CaptureTable>;
export type CaptureUpdate = Updateable<CaptureTable>;
export type CaptureDecodeRow = Selectable<CaptureDecodeTable>;
export type NewCaptureDecodeRow = Insertable<CaptureDecodeTable>;
