import { spawnSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { gzipSync } from 'node:zlib';
import { BENCH_DIR } from './args';

export interface BundleFigures {
  buildSeconds: number;
  /** The JS the page loads before any route chunk: the entry script and its modulepreload links. */
  files: { file: string; bytes: number; gzip: number }[];
  jsGzip: number;
  jsBytes: number;
  cssGzip: number;
  /** What the service worker keeps on the device for opening offline, fetched after the first load. */
  precache: { files: number; bytes: number; gzip: number };
}

/** The files the generated service worker precaches, weighed as they travel (gzip). */
function weighPrecache(outDir: string) {
  const sw = readFileSync(join(outDir, 'sw.js'), 'utf8');
  const urls = [...new Set([...sw.matchAll(/url:"([^"]+)"/g)].map((m) => m[1]))];
  let bytes = 0;
  let gzip = 0;
  for (const u of urls) {
    const buf = readFileSync(join(outDir, u.replace(/^\//, '')));
    bytes += buf.length;
    gzip += gzipSync(buf).length;
  }
  return { files: urls.length, bytes, gzip };
}

/** Builds the client into its own folder (dist/ stays as it is) and weighs what index.html loads first. */
export function buildAndWeigh(outDir: string): BundleFigures {
  const root = resolve(BENCH_DIR, '..');
  const t0 = performance.now();
  const r = spawnSync('npx', ['vite', 'build', '--outDir', outDir, '--emptyOutDir', '--logLevel', 'warn'], { cwd: root, encoding: 'utf8' });
  if (r.status !== 0) throw new Error(`vite build failed:\n${r.stdout}\n${r.stderr}`);
  const buildSeconds = (performance.now() - t0) / 1000;
  const html = readFileSync(join(outDir, 'index.html'), 'utf8');
  const attr = (tag: string, name: string) => new RegExp(`${name}="([^"]+)"`).exec(tag)?.[1];
  const tags = html.match(/<(script|link)\b[^>]*>/g) ?? [];
  const js = tags
    .filter((t) => (t.startsWith('<script') && /type="module"/.test(t)) || /rel="modulepreload"/.test(t))
    .map((t) => attr(t, 'src') ?? attr(t, 'href'))
    .filter((u): u is string => !!u);
  const css = tags.filter((t) => /rel="stylesheet"/.test(t)).map((t) => attr(t, 'href')).filter((u): u is string => !!u);
  const weigh = (url: string) => {
    const buf = readFileSync(join(outDir, url.replace(/^\//, '')));
    return { file: url, bytes: buf.length, gzip: gzipSync(buf).length };
  };
  const files = [...new Set(js)].map(weigh);
  return {
    buildSeconds,
    files,
    jsGzip: files.reduce((s, f) => s + f.gzip, 0),
    jsBytes: files.reduce((s, f) => s + f.bytes, 0),
    cssGzip: css.map(weigh).reduce((s, f) => s + f.gzip, 0),
    precache: weighPrecache(outDir),
  };
}
