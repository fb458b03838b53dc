// `npm run db:backup -- FILE`: copies the database (DATABASE_PATH, default data/framewright.db,
// also read from .env) to FILE while the server may keep running. Restoring: README.md.
import { existsSync } from 'node:fs';
import { databasePathFromEnv } from '../src/lib/server/db/connection';
import { backupDatabase } from './backup';

if (existsSync('.env')) process.loadEnvFile('.env');
const target = process.argv[2];
if (!target || target.startsWith('-')) {
	console.error('Usage: npm run db:backup -- FILE   (FILE must not exist yet)');
	process.exitCode = 2;
} else {
	const source = databasePathFromEnv();
	try {
		const { bytes } = await backupDatabase(source, target);
		console.log(`Backed up ${source} to ${target} (${bytes} bytes, integrity check ok).`);
	} catch (error) {
		console.error(error instanceof Error ? error.message : String(error));
		process.exitCode = 1;
	}
}
