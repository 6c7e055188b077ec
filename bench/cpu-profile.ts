import { Session } from 'node:inspector/promises';

/** Where the server's CPU went during a load: V8's sampling profiler, summed by self time. */

export interface CpuShare {
  what: string;
  ms: number;
  share: number;
}
export interface CpuSummary {
  sampledMs: number;
  byPart: CpuShare[];
  topFunctions: CpuShare[];
}

interface ProfileNode {
  id: number;
  callFrame: { functionName: string; url: string };
}
interface Profile {
  nodes: ProfileNode[];
  samples: number[];
  timeDeltas: number[];
}

/** Which part of the stack a function belongs to: a package, the app's own code, the engine's WASM, or Node. */
function partOf({ functionName, url }: ProfileNode['callFrame']) {
  if (functionName === '(idle)') return 'idle (waiting for I/O)';
  if (functionName === '(garbage collector)') return 'garbage collection';
  if (!url) return 'native (file reads and stats, V8)';
  if (url.startsWith('wasm://')) return 'PGlite WASM (PostgreSQL itself)';
  const pkg = /node_modules\/((?:@[^/]+\/)?[^/]+)/.exec(url)?.[1];
  if (pkg) return pkg;
  if (url.startsWith('node:')) return 'Node.js internals';
  const own = /\/work\/[^/]+\/[^/]+\/(server|shared|jobs|bench)\//.exec(url) ?? /\/(server|shared|jobs|bench)\//.exec(url);
  return own ? `app: ${own[1]}/` : 'other';
}

export function cpuProfiler() {
  const session = new Session();
  session.connect();
  return {
    async start() {
      await session.post('Profiler.enable');
      await session.post('Profiler.setSamplingInterval', { interval: 500 });
      await session.post('Profiler.start');
    },
    async stop(top = 12): Promise<CpuSummary> {
      const { profile } = (await session.post('Profiler.stop')) as unknown as { profile: Profile };
      const nodes = new Map(profile.nodes.map((n) => [n.id, n]));
      const parts = new Map<string, number>();
      const fns = new Map<string, number>();
      let total = 0;
      profile.samples.forEach((id, i) => {
        const n = nodes.get(id)!;
        const ms = profile.timeDeltas[i] / 1000;
        total += ms;
        const part = partOf(n.callFrame);
        parts.set(part, (parts.get(part) ?? 0) + ms);
        const fn = `${n.callFrame.functionName || '(anonymous)'} [${part}]`;
        fns.set(fn, (fns.get(fn) ?? 0) + ms);
      });
      const list = (m: Map<string, number>) =>
        [...m].sort((a, b) => b[1] - a[1]).slice(0, top).map(([what, ms]) => ({ what, ms, share: ms / total }));
      return { sampledMs: total, byPart: list(parts), topFunctions: list(fns) };
    },
  };
}
