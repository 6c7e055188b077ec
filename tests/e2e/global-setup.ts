import { execFileSync } from 'node:child_process';

/** The browser tests run against the production build, as a user gets it. */
export default function setup() {
  execFileSync('npx', ['vite', 'build', '--logLevel', 'error'], { stdio: 'inherit' });
}
