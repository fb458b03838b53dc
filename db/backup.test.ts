// `npm run db:backup -- FILE` (issue 10, operations): SQLite's online backup API, via better-sqlite3,
// copies a database that is open and being written, and the copy opens with every row.
import { execFile } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';
import SQLite from 'better-sqlite3';
import { afterEach, describe, expect, it } from 'vitest';
import { createDatabase, migrateToLatest } from '../src/lib/server/db';
import { createTeam } from '../src/lib/server/test-support';
import { backupDatabase } from './backup';

const folders: string[] = [];
afterEach(() => {
	for (const folder of folders.splice(0)) rmSync(folder, { recursive: true, force: true });
});
function tempFolder(): string {
	const folder = mkdtempSync(join(tmpdir(), 'fw-backup-test-'));
	folders.push(folder);
	return folder;
}

describe('database backup', () => {
	it('copies a live database (open, in WAL mode, mid-use) with all its rows', async () => {
		const folder = tempFolder();
		const source = join(folder, 'live.db');
		const db = createDatabase(source);
		await migrateToLatest(db);
		await createTeam(db, 'Backup team');
		const target = join(folder, 'copy.db');
		const result = await backupDatabase(source, target);
		await db.destroy();
		expect(result.bytes).toBeGreaterThan(0);
		const copy = new SQLite(target, { readonly: true });
		const names = copy.prepare('select name from workspaces order by name').pluck().all();
		const users = copy.prepare('select count(*) from "User"').pluck().get();
		copy.close();
		expect(names).toEqual(['Backup team']);
		expect(users).toBe(4);
	});

	it('refuses to write over an existing file or to read a missing database', async () => {
		const folder = tempFolder();
		const source = join(folder, 'live.db');
		const db = createDatabase(source);
		await migrateToLatest(db);
		await db.destroy();
		await expect(backupDatabase(source, source)).rejects.toThrow(/exists already/);
		await expect(backupDatabase(join(folder, 'none.db'), join(folder, 'x.db'))).rejects.toThrow(
			/no database/
		);
	});

	it('npm run db:backup -- FILE, as a command', async () => {
		const folder = tempFolder();
		const source = join(folder, 'live.db');
		const db = createDatabase(source);
		await migrateToLatest(db);
		await db.destroy();
		const target = join(folder, 'nightly.db');
		const { stdout } = await promisify(execFile)('npx', ['tsx', 'db/backup-cli.ts', target], {
			env: { ...process.env, DATABASE_PATH: source }
		});
		expect(stdout).toMatch(
			/^Backed up .*live\.db to .*nightly\.db \(\d+ bytes, integrity check ok\)\./
		);
	});
});
