// Part of `npm run build`: bundles db/demo-start.ts (migrate, and seed an empty demo database) into
// one ES module beside the server build, which scripts/serve.js runs before it starts the server.
// Packages stay imports (the build folder sits inside the project, beside node_modules).
import { resolve } from 'node:path';
import * as esbuild from 'esbuild';

// scripts/serve.js looks for this name.
const outfile = resolve(process.env.FW_BUILD_DIR || 'build', 'demo-start.mjs');
await esbuild.build({
	entryPoints: [resolve('db/demo-start.ts')],
	outfile,
	bundle: true,
	platform: 'node',
	format: 'esm',
	target: 'node20',
	packages: 'external',
	logLevel: 'warning'
});
console.log(`Demo start-up bundled into ${outfile}`);
