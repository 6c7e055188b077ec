import { execFileSync } from 'node:child_process';

import { buildServer } from '../../server/build';

/** The browser tests run against the production build, client and server, as a user gets it. */
export default async function setup() {
  // Vitest sets NODE_ENV=test, which would make Vite build React's development copy and leave out
  // the service worker: the build is made as `npm run build` makes it.
  execFileSync('npx', ['vite', 'build', '--logLevel', 'error'], { stdio: 'inherit', env: { ...process.env, NODE_ENV: 'production' } });
  await buildServer();
}
