import type { Migration, MigrationProvider } from 'kysely';
import * as auth from './2026-12-01-001-auth';
import * as workspaces from './2026-12-01-002-workspaces';
import * as auditLog from './2026-12-01-003-audit-log';
import * as signinRequests from './2026-12-01-004-signin-requests';
import * as mailbox from './2026-12-01-005-mailbox';
import * as maps from './2026-12-01-006-maps';
import * as captures from './2026-12-01-007-captures';
import * as revisionDraftVersion from './2026-12-02-010-revision-draft-version';
import * as receivers from './2026-12-02-030-receivers';
import * as accessTokens from './2026-12-02-040-access-tokens';
import * as captureViews from './2026-12-02-050-capture-views';
import * as captureBitrate from './2026-12-02-110-capture-bitrate';
import * as decodeBus from './2026-12-02-111-decode-bus';

// An explicit, ordered list instead of reading the folder: it works the same under Vite, the
// production bundle, vitest and tsx. Append new migrations at the end; never rename or edit old ones.
export const migrations: Record<string, Migration> = {
	'2026-12-01-001-auth': auth,
	'2026-12-01-002-workspaces': workspaces,
	'2026-12-01-003-audit-log': auditLog,
	'2026-12-01-004-signin-requests': signinRequests,
	'2026-12-01-005-mailbox': mailbox,
	'2026-12-01-006-maps': maps,
	'2026-12-01-007-captures': captures,
	'2026-12-02-010-revision-draft-version': revisionDraftVersion,
	'2026-12-02-030-receivers': receivers,
	'2026-12-02-040-access-tokens': accessTokens,
	'2026-12-02-050-capture-views': captureViews,
	'2026-12-02-110-capture-bitrate': captureBitrate,
	'2026-12-02-111-decode-bus': decodeBus
};

export const migrationProvider: MigrationProvider = {
	getMigrations: async () => migrations
};
