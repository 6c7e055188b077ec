import type { Express } from 'express';
import { ruleOf, type Rule } from './middleware/auth';

export interface RouteEntry {
  method: string;
  path: string;
  rule: Rule | undefined;
}

interface Layer {
  route?: { path: string; methods: Record<string, boolean>; stack: { handle: unknown }[] };
  handle: { stack?: Layer[] };
  rawPath?: string | string[];
}

/** Every route the app registers, read from Express's own router, with its access rule. */
export function listRoutes(app: Express): RouteEntry[] {
  const out: RouteEntry[] = [];
  const walk = (stack: Layer[], prefix: string) => {
    for (const layer of stack) {
      if (layer.route) {
        const first = layer.route.stack[0]?.handle;
        for (const method of Object.keys(layer.route.methods)) {
          out.push({ method: method.toUpperCase(), path: (prefix + layer.route.path).replace(/(.)\/$/, '$1'), rule: ruleOf(first) });
        }
      } else if (layer.handle.stack) {
        const raw = typeof layer.rawPath === 'string' ? layer.rawPath : '';
        walk(layer.handle.stack, prefix + (raw === '/' ? '' : raw));
      }
    }
  };
  walk((app as unknown as { router: { stack: Layer[] } }).router.stack, '');
  return out;
}

/** Deny by default: refuse to build an app in which any route lacks an access rule. */
export function assertEveryRouteRuled(app: Express) {
  const unruled = listRoutes(app).filter((r) => r.path.startsWith('/api') && !r.rule);
  if (unruled.length)
    throw new Error(`Routes without an access rule: ${unruled.map((r) => `${r.method} ${r.path}`).join(', ')}`);
}
