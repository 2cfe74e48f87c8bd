/**
 * The Content-Security-Policy of the built app: one source of truth, read by
 * vite.config.ts (the header `vite preview` sends) and by tests/browser/csp.test.ts.
 *
 * Everything comes from the app's own origin; nothing runs from data. Images may also be
 * blob: URLs (a traced or background picture kept in IndexedDB) and data: URLs (the
 * page's inline icon). No 'unsafe-inline' and no 'unsafe-eval': the page and its workers
 * forgo code built from strings (src/core/codeGeneration.ts), so the interpreter in
 * src/core/linkage/run.ts runs the linkage kernel's operations, with the same results.
 */
const DIRECTIVES: readonly (readonly [string, string])[] = [
  ['default-src', "'none'"],
  // 'report-sample' only adds the first 40 characters of refused code to a violation's
  // report, so a refusal would say whose it is; it allows nothing.
  ['script-src', "'self' 'report-sample'"],
  ['worker-src', "'self'"],
  ['style-src', "'self'"],
  ['img-src', "'self' blob: data:"],
  ['font-src', "'self'"],
  ['connect-src', "'self'"],
  ['manifest-src', "'self'"],
  ['object-src', "'none'"],
  ['base-uri', "'none'"],
  ['form-action', "'none'"],
  ['frame-ancestors', "'none'"],
];

export const CONTENT_SECURITY_POLICY = DIRECTIVES.map(([name, sources]) => `${name} ${sources}`).join('; ');
