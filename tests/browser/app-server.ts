/**
 * Builds the app with Vite's JS API, from the same vite.config.ts as `npm run build`,
 * and serves the result with `vite preview` on a free port of 127.0.0.1.
 */
import type { AddressInfo } from 'node:net';
import { fileURLToPath } from 'node:url';
import { build, preview } from 'vite';

export const REPO_ROOT = fileURLToPath(new URL('../../', import.meta.url));
const VITE_CONFIG = fileURLToPath(new URL('../../vite.config.ts', import.meta.url));

export async function buildApp(outDir: string): Promise<void> {
  // Vitest sets NODE_ENV=test, and Vite would then bundle React's development build;
  // the tests must see what `npm run build` ships.
  const savedNodeEnv = process.env.NODE_ENV;
  process.env.NODE_ENV = 'production';
  try {
    await build({
      root: REPO_ROOT,
      configFile: VITE_CONFIG,
      mode: 'production',
      logLevel: 'warn',
      build: { outDir, emptyOutDir: true },
    });
  } finally {
    if (savedNodeEnv === undefined) delete process.env.NODE_ENV;
    else process.env.NODE_ENV = savedNodeEnv;
  }
}

export interface ServedApp {
  /** The page's origin with a trailing slash, e.g. `http://127.0.0.1:41234/`. */
  readonly baseUrl: string;
  close(): Promise<void>;
}

export async function serveApp(outDir: string): Promise<ServedApp> {
  const server = await preview({
    root: REPO_ROOT,
    configFile: VITE_CONFIG,
    logLevel: 'warn',
    build: { outDir },
    // Port 0: the system picks a free port, read back from the socket below.
    preview: { host: '127.0.0.1', port: 0, strictPort: true, open: false },
  });
  const address = server.httpServer.address() as AddressInfo | string | null;
  if (address === null || typeof address === 'string') {
    await server.close();
    throw new Error(`vite preview is not listening on a TCP port (address: ${String(address)})`);
  }
  return {
    baseUrl: `http://127.0.0.1:${address.port}/`,
    close: () => server.close(),
  };
}
