import { readdirSync, readFileSync } from 'node:fs';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { dirname, join, relative, resolve } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { buildServer, SERVER_BUNDLE, SERVER_NODE_FLAGS } from '../../server/build';

const root = resolve(import.meta.dirname, '../..');
const scripts = (JSON.parse(readFileSync(join(root, 'package.json'), 'utf8')) as { scripts: Record<string, string> }).scripts;
let out: string | undefined;
afterAll(async () => {
  if (out) await rm(out, { recursive: true, force: true });
});

/** Local modules reachable from the entry through static `import … from` and `import "…"`, not through `import()`. */
function staticallyLoaded(entry: string) {
  const seen = new Set<string>();
  const visit = (file: string) => {
    if (seen.has(file)) return;
    seen.add(file);
    const text = readFileSync(file, 'utf8');
    for (const m of text.matchAll(/^\s*(?:import|export)\s[^;]*?from\s*"(\.[^"]+)"|^\s*import\s*"(\.[^"]+)"/gm)) visit(resolve(dirname(file), m[1] ?? m[2]));
  };
  visit(entry);
  return [...seen];
}

describe('the compiled server', () => {
  it('runs with the same Node options from npm start and npm run demo', () => {
    const run = `node ${SERVER_NODE_FLAGS.join(' ')} ${SERVER_BUNDLE}`;
    expect(scripts.start).toContain(run);
    expect(scripts.demo).toContain(`${run} --demo`);
  });

  it('loads the S3 client, the image library and the mail catcher only when first used', async () => {
    out = await mkdtemp(join(tmpdir(), 'lashline-build-'));
    const entry = await buildServer('server/index.ts', relative(root, out));
    const files = staticallyLoaded(entry);
    const imports = files.map((f) => readFileSync(f, 'utf8')).join('\n');
    // What the server needs at every start is there...
    expect(imports).toMatch(/from "express"/);
    expect(imports).toMatch(/from "@electric-sql\/pglite"/);
    // ...and what it needs now and then is not.
    for (const pkg of ['@aws-sdk/client-s3', 'sharp', 'smtp-server', 'mailparser']) expect(imports).not.toContain(`from "${pkg}"`);
    // They are still in the build, behind import().
    const all = readdirSync(out).map((f) => readFileSync(join(out!, f), 'utf8')).join('\n');
    expect(all).toMatch(/import\("sharp"\)/);
    expect(all).toMatch(/from "@aws-sdk\/client-s3"/);
  });
});
