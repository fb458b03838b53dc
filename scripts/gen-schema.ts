/**
 * Writes schema/framewright-map.schema.json from the zod map model (`npm run schema`).
 * map-json.test.ts fails when the shipped file is out of date.
 */
import { writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { mapJsonSchema } from '../src/lib/can/map-json';

const target = fileURLToPath(new URL('../schema/framewright-map.schema.json', import.meta.url));
writeFileSync(target, `${JSON.stringify(mapJsonSchema(), null, '\t')}\n`);
console.log(`wrote ${target}`);
