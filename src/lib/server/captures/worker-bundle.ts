/**
 * Where the capture worker's JavaScript comes from. The entry is TypeScript, which a worker thread
 * cannot load, so esbuild bundles it into one ES module: at build time into the build folder
 * (`npm run build` runs scripts/build-capture-worker.ts; scripts/serve.js points FW_CAPTURE_WORKER
 * at it), and on demand into a temporary file when the source is present (vite dev, vitest, tsx).
 */
import { existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

export const WORKER_FILE_NAME = 'capture-worker.mjs';
const SOURCE_NAME = 'capture-worker.ts';

/** Bundles the worker entry into `outfile` (one ES module, Node 20, papaparse included). */
export async function bundleCaptureWorker(outfile: string): Promise<void> {
	const esbuild = await import('esbuild');
	await esbuild.build({
		entryPoints: [join(sourceFolder(), SOURCE_NAME)],
		outfile,
		bundle: true,
		platform: 'node',
		format: 'esm',
		target: 'node20',
		logLevel: 'warning',
		// CommonJS dependencies bundled into an ES module may still call require().
		banner: {
			js: "import { createRequire as __fwRequire } from 'node:module'; const require = __fwRequire(import.meta.url);"
		}
	});
}

function sourceFolder(): string {
	return dirname(fileURLToPath(import.meta.url));
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
			const outfile = join(tmpdir(), `framewright-capture-worker-${process.pid}.mjs`);
			await bundleCaptureWorker(outfile);
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
