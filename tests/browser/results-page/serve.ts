/**
 * Builds the results test page with the app's own Vite config and serves it inside a
 * browser context at the app's origin, under PAGE_BASE, by routing those requests to the
 * build folder: the page then counts as the app's own for the harness's request checks.
 */
import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { extname, join, normalize } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { BrowserContext } from 'playwright-core';
import { build } from 'vite';

export const PAGE_BASE = '/__results-test/';
const PAGE_ROOT = fileURLToPath(new URL('./', import.meta.url));
const VITE_CONFIG = fileURLToPath(new URL('../../../vite.config.ts', import.meta.url));

const CONTENT_TYPES: Readonly<Record<string, string>> = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.map': 'application/json; charset=utf-8',
  '.svg': 'image/svg+xml',
};

export interface BuiltPage {
  readonly outDir: string;
  /** Serves the page in `context` at `baseUrl` + PAGE_BASE. */
  route(context: BrowserContext, baseUrl: string): Promise<void>;
  remove(): Promise<void>;
}

export async function buildResultsPage(): Promise<BuiltPage> {
  const outDir = await mkdtemp(join(tmpdir(), 'loci-results-page-'));
  // As app-server.ts does: the page must be the production build, not React's development one.
  const savedNodeEnv = process.env.NODE_ENV;
  process.env.NODE_ENV = 'production';
  try {
    await build({
      root: PAGE_ROOT,
      configFile: VITE_CONFIG,
      base: PAGE_BASE,
      mode: 'production',
      logLevel: 'warn',
      build: { outDir, emptyOutDir: true },
    });
  } catch (error) {
    await rm(outDir, { recursive: true, force: true });
    throw error;
  } finally {
    if (savedNodeEnv === undefined) delete process.env.NODE_ENV;
    else process.env.NODE_ENV = savedNodeEnv;
  }
  return {
    outDir,
    async route(context, baseUrl) {
      const origin = new URL(baseUrl).origin;
      await context.route((url) => url.origin === origin && url.pathname.startsWith(PAGE_BASE), async (route) => {
        const path = new URL(route.request().url()).pathname.slice(PAGE_BASE.length) || 'index.html';
        const file = normalize(join(outDir, decodeURIComponent(path)));
        if (!file.startsWith(outDir)) return route.fulfill({ status: 403, body: 'outside the test page' });
        try {
          const body = await readFile(file);
          await route.fulfill({ status: 200, body, contentType: CONTENT_TYPES[extname(file)] ?? 'application/octet-stream' });
        } catch {
          await route.fulfill({ status: 404, body: `no ${path} in the test page` });
        }
      });
    },
    remove: () => rm(outDir, { recursive: true, force: true }),
  };
}
