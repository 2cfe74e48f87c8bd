// comlink ships types for its Node adapter only beside the .js name; Node's ESM loader
// needs the .mjs file, so this points the .mjs specifier at comlink's own declaration.
declare module 'comlink/dist/esm/node-adapter.mjs' {
  export { default } from 'comlink/dist/esm/node-adapter';
  export type { NodeEndpoint } from 'comlink/dist/esm/node-adapter';
}
