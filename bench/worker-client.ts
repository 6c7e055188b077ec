import { fork, type ChildProcess } from 'node:child_process';
import { join } from 'node:path';
import { buildServer, SERVER_NODE_FLAGS } from '../server/build';
import { DATA_ROOT } from './args';

export interface Memory {
  rss: number;
  heapUsed: number;
  external: number;
  maxRss: number;
}

export interface Worker {
  url: string;
  openMs: number;
  startMemory: Memory;
  call<T>(cmd: string, args?: Record<string, unknown>): Promise<T>;
  stop(): Promise<void>;
}

let bundle: Promise<string> | undefined;
/** bench/worker.ts compiled the way `npm start` compiles the server, once per run. */
const workerBundle = () => (bundle ??= buildServer('bench/worker.ts', join(DATA_ROOT, 'worker')));

/**
 * Starts bench/worker.ts, compiled, in a child process under plain Node as `npm start` runs the
 * server, and waits for it to listen. `nodeArgs`: extra Node options for the server, e.g.
 * `--cpu-prof` to see where its time goes.
 */
export async function startWorker(opts: { dataDir?: string; dist?: string; nodeArgs?: string[] }): Promise<Worker> {
  const args = [...(opts.dataDir ? ['--data', opts.dataDir] : []), ...(opts.dist ? ['--dist', opts.dist] : [])];
  const child: ChildProcess = fork(await workerBundle(), args, {
    execArgv: [...SERVER_NODE_FLAGS, '--expose-gc', ...(opts.nodeArgs ?? [])],
    env: { ...process.env, NODE_ENV: 'production' },
    stdio: ['ignore', 'inherit', 'inherit', 'ipc'],
  });
  const pending = new Map<number, { resolve: (v: unknown) => void; reject: (e: Error) => void }>();
  let next = 1;
  const ready = await new Promise<{ port: number; openMs: number; memory: Memory }>((resolve, reject) => {
    const onExit = (code: number | null) => reject(new Error(`The benchmark server exited with ${code} before it was ready.`));
    child.once('exit', onExit);
    child.on('message', (m: { ready?: boolean; id?: number; ok?: boolean; result?: unknown; error?: string; port?: number; openMs?: number; memory?: Memory }) => {
      if (m.ready) {
        child.off('exit', onExit);
        resolve(m as { port: number; openMs: number; memory: Memory });
        return;
      }
      const p = pending.get(m.id!);
      if (!p) return;
      pending.delete(m.id!);
      if (m.ok) p.resolve(m.result);
      else p.reject(new Error(m.error));
    });
  });
  child.on('exit', (code) => {
    for (const p of pending.values()) p.reject(new Error(`The benchmark server exited with ${code}.`));
    pending.clear();
  });
  const exited = new Promise<void>((r) => child.once('exit', () => r()));
  return {
    url: `http://127.0.0.1:${ready.port}`,
    openMs: ready.openMs,
    startMemory: ready.memory,
    call: <T>(cmd: string, a?: Record<string, unknown>) =>
      new Promise<T>((resolve, reject) => {
        const id = next++;
        pending.set(id, { resolve: resolve as (v: unknown) => void, reject });
        child.send({ id, cmd, args: a });
      }),
    async stop() {
      const id = next++;
      child.send({ id, cmd: 'stop' });
      await Promise.race([exited, new Promise((r) => setTimeout(r, 20_000))]);
      if (child.exitCode === null) child.kill('SIGKILL');
    },
  };
}
