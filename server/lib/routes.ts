import type { Express } from 'express';

export type RouteInfo = { method: string; path: string };

type Layer = {
  rawPath?: string | string[];
  route?: { path: string | string[]; methods: Record<string, boolean> };
  handle?: { stack?: Layer[] };
};

/** Every route the app registers, read from Express's own router (the authorisation and fuzz tests use it). */
export function listRoutes(app: Express): RouteInfo[] {
  const out: RouteInfo[] = [];
  const walk = (stack: Layer[], prefix: string) => {
    for (const layer of stack) {
      if (layer.route) {
        const paths = Array.isArray(layer.route.path) ? layer.route.path : [layer.route.path];
        for (const p of paths) {
          for (const [m, on] of Object.entries(layer.route.methods)) {
            if (on && m !== '_all') out.push({ method: m.toUpperCase(), path: join(prefix, p) });
          }
        }
      } else if (layer.handle?.stack) {
        const raw = Array.isArray(layer.rawPath) ? layer.rawPath : [layer.rawPath ?? ''];
        for (const p of raw) walk(layer.handle.stack, join(prefix, typeof p === 'string' ? p : ''));
      }
    }
  };
  const root = (app as unknown as { router: { stack: Layer[] } }).router;
  walk(root.stack, '');
  return out.filter((r) => r.path.startsWith('/api/'));
}

function join(a: string, b: string) {
  const s = `${a.replace(/\/$/, '')}/${b.replace(/^\//, '')}`;
  return s.length > 1 ? s.replace(/\/$/, '') : s;
}
