/** What the browser project's globalSetup hands every browser test file. */
export type BrowserSetup =
  | { readonly status: 'ready'; readonly baseUrl: string; readonly chromiumPath: string }
  | { readonly status: 'skipped'; readonly reason: string };

declare module 'vitest' {
  export interface ProvidedContext {
    lociBrowser: BrowserSetup;
  }
}
