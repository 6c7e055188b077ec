import { basename, extname, join, resolve } from 'node:path';
import { rmSync } from 'node:fs';
import { build } from 'esbuild';

/**
 * The server compiled to one ES module for production: plain Node runs it without a TypeScript
 * loader in the process (less memory, faster start). Packages stay in node_modules, imported as
 * they are; what the code imports on demand (the S3 client, the mail catcher) goes into chunks of
 * its own, so it loads only when used. Not minified, so stack traces keep their names.
 *
 *   npm run build:server        → build/server/index.mjs
 */
export const SERVER_DIR = 'build/server';
/**
 * Node options of every run of the compiled server (npm start, npm run demo, the browser tests, the
 * benchmark), measured with npm run bench at 2,000 bikes: young-generation semi-spaces of 4 MB
 * instead of V8's 16 MB, and an old generation that grows by 60 % between full collections instead
 * of V8's own (larger) factor, hold the resident memory about 140 MB lower at the same latency and
 * the same due-scan time (a growth of 30 % slowed the scan by a fifth).
 */
export const SERVER_NODE_FLAGS = ['--max-semi-space-size=4', '--heap-growing-percent=60'];
export const SERVER_BUNDLE = `${SERVER_DIR}/index.mjs`;

/** Compiles `entry` and what it imports into `outdir`; answers the path of the entry's module. */
export async function buildServer(entry = 'server/index.ts', outdir = SERVER_DIR) {
  const root = resolve(import.meta.dirname, '..');
  // Chunk names change with their contents: no chunk of an earlier build is left behind.
  rmSync(resolve(root, outdir), { recursive: true, force: true });
  await build({
    absWorkingDir: root,
    entryPoints: [entry],
    outdir,
    entryNames: '[name]',
    chunkNames: 'chunk-[hash]',
    outExtension: { '.js': '.mjs' },
    splitting: true,
    bundle: true,
    platform: 'node',
    target: 'node20',
    format: 'esm',
    packages: 'external',
    logLevel: 'warning',
  });
  return resolve(root, join(outdir, `${basename(entry, extname(entry))}.mjs`));
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const out = await buildServer();
  console.log(`Server built: ${out}`);
}
