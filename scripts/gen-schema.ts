/**
 * Writes the JSON Schemas in schema/ from the zod models (`npm run schema`): the map, the receiver
 * profile and the receive set. map-json.test.ts and receivers/schema.test.ts fail when a shipped
 * file is out of date.
 */
import { writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { mapJsonSchema } from '../src/lib/can/map-json';
import { profileJsonSchema } from '../src/lib/can/receivers/profile';
import { receiveSetJsonSchema } from '../src/lib/can/receivers/receive-set';

const schemas: [string, Record<string, unknown>][] = [
	['framewright-map.schema.json', mapJsonSchema()],
	['framewright-profile.schema.json', profileJsonSchema()],
	['framewright-receive.schema.json', receiveSetJsonSchema()]
];
for (const [file, schema] of schemas) {
	const target = fileURLToPath(new URL(`../schema/${file}`, import.meta.url));
	writeFileSync(target, `${JSON.stringify(schema, null, '\t')}\n`);
	console.log(`wrote ${target}`);
}
