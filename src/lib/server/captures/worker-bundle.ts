/**
 * Where the capture worker's JavaScript comes from. The entry is TypeScript, which a worker thread
 * cannot load, so esbuild bundles our own code into one ES module (packages stay imports, resolved
 * from the project's node_modules like the server build's): at build time into the build folder
 * (`npm run build` runs scripts/build-capture-worker.ts; scripts/serve.js points FW_CAPTURE_WORKER
 * at it), and on demand into node_modules/.cache when the source is present (vite dev, vitest, tsx).
 */
import { existsSync, mkdirSync, rmSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

export const WORKER_FILE_NAME = 'capture-worker.mjs';
const SOURCE_NAME = 'capture-worker.ts';

/** Bundles the worker entry into `outfile` (one ES module for Node 20; packages left as imports). */
export async function bundleCaptureWorker(outfile: string): Promise<void> {
	const esbuild = await import('esbuild');
	await esbuild.build({
		entryPoints: [join(sourceFolder(), SOURCE_NAME)],
		outfile,
		bundle: true,
		packages: 'external',
		platform: 'node',
		format: 'esm',
		target: 'node20',
		logLevel: 'warning'
	});
}

function sourceFolder(): string {
	return dirname(fileURLToPath(import.meta.url));
}

/** The project folder: the one holding node_modules, above the source. */
function projectFolder(): string {
	let dir = sourceFolder();
	while (!existsSync(join(dir, 'node_modules')) && dirname(dir) !== dir) dir = dirname(dir);
	return dir;
}

let onDemand: Promise<string> | undefined;

export function captureWorkerPath(): Promise<string> {
	const configured = process.env.FW_CAPTURE_WORKER;
	if (configured) {
		if (!existsSync(configured))
			return Promise.reject(
				new Error(
					`FW_CAPTURE_WORKER points at ${configured}, which does not exist; run \`npm run build\`.`
				)
			);
		return Promise.resolve(resolve(configured)); // a Worker needs an absolute path
	}
	if (existsSync(join(sourceFolder(), SOURCE_NAME))) {
		onDemand ??= (async () => {
			// Inside the project, so the bundle's package imports resolve from its node_modules.
			const folder = join(projectFolder(), 'node_modules', '.cache', 'framewright');
			mkdirSync(folder, { recursive: true });
			const outfile = join(folder, `capture-worker-${process.pid}.mjs`);
			await bundleCaptureWorker(outfile);
			process.once('exit', () => rmSync(outfile, { force: true }));
			return outfile;
		})().catch((error: unknown) => {
			onDemand = undefined;
			throw error;
		});
		return onDemand;
	}
	// Running from a production build without scripts/serve.js.
	const built = resolve(process.env.FW_BUILD_DIR || 'build', WORKER_FILE_NAME);
	if (existsSync(built)) return Promise.resolve(built);
	return Promise.reject(
		new Error(`The capture worker is missing (${built}); run \`npm run build\`.`)
	);
}
