// After the Playwright run: removes the run's temporary database and capture store
// (playwright.config.ts puts both in one folder named by FW_E2E_DATA). The web server may still be
// stopping; on Linux and macOS its open files simply vanish with the folder.
import { rmSync } from 'node:fs';
import { tmpdir } from 'node:os';

export default function globalTeardown(): void {
	const folder = process.env.FW_E2E_DATA;
	// Only ever a folder of ours in the temp folder.
	if (folder?.startsWith(tmpdir()) && /framewright-e2e-\d+-\d+$/.test(folder))
		rmSync(folder, { recursive: true, force: true });
}
