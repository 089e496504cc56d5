// The TypeScript sources for the hand scripts and child processes of the tests, through Vite
// (installed for vitest; no new package), so that nothing needs building: tsServer() starts a
// module server on the project's root; load its modules with server.ssrLoadModule('/src/…ts') and
// close it when done.
import { createServer } from 'vite';
import { fileURLToPath } from 'node:url';

export const root = fileURLToPath(new URL('..', import.meta.url));

export function tsServer() {
  return createServer({
    root,
    configFile: false,
    logLevel: 'error',
    server: { middlewareMode: true, hmr: false, ws: false },
    appType: 'custom',
    optimizeDeps: { noDiscovery: true, include: [] },
  });
}
