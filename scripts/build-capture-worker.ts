// Part of `npm run build`: bundles the capture worker thread's TypeScript entry into one ES module
// beside the server build (FW_BUILD_DIR, default build/), where scripts/serve.js points the server at it.
import { resolve } from 'node:path';
import { bundleCaptureWorker, WORKER_FILE_NAME } from '../src/lib/server/captures/worker-bundle';

const outfile = resolve(process.env.FW_BUILD_DIR || 'build', WORKER_FILE_NAME);
await bundleCaptureWorker(outfile);
console.log(`Capture worker bundled into ${outfile}`);
