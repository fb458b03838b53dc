// An online copy of the SQLite database with SQLite's backup API (better-sqlite3's `backup()`):
// consistent even while the server writes, page by page, without stopping it. How to restore is
// in README.md ("Backup and restore").
import { existsSync, statSync } from 'node:fs';
import SQLite from 'better-sqlite3';

export interface BackupResult {
	bytes: number;
	pages: number;
}

/** Copies `source` to the new file `target` and checks the copy (`pragma integrity_check`). */
export async function backupDatabase(source: string, target: string): Promise<BackupResult> {
	if (!existsSync(source)) throw new Error(`There is no database at ${source} (DATABASE_PATH).`);
	// Never over an existing file: an older backup, or the live database itself.
	if (existsSync(target)) throw new Error(`${target} exists already; name a new file.`);
	const db = new SQLite(source, { fileMustExist: true });
	let pages: number;
	try {
		({ totalPages: pages } = await db.backup(target));
	} finally {
		db.close();
	}
	const copy = new SQLite(target, { readonly: true });
	try {
		const check = copy.pragma('integrity_check', { simple: true });
		if (check !== 'ok')
			throw new Error(`The copy at ${target} failed its integrity check: ${check}`);
	} finally {
		copy.close();
	}
	return { bytes: statSync(target).size, pages };
}
