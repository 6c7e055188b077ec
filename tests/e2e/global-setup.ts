import { execFileSync } from 'node:child_process';

import { buildServer } from '../../server/build';

/** The browser tests run against the production build, client and server, as a user gets it. */
export default async function setup() {
  execFileSync('npx', ['vite', 'build', '--logLevel', 'error'], { stdio: 'inherit' });
  await buildServer();
}
