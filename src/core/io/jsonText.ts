/**
 * A file's text read as JSON, the one way every reader of our files does it: a leading
 * byte-order mark dropped (editors on some systems write one), and a parse error as a
 * message that shows nothing unprintable and says where the parser stopped.
 */
import { escapeUnprintable } from '../linkage/model';

export type JsonTextResult = { readonly ok: true; readonly json: unknown } | { readonly ok: false; readonly message: string };

/** " (line L, column C)" of the position a JSON parser's message names, or ''. */
function lineAndColumn(text: string, message: string): string {
  const match = /position (\d+)/.exec(message);
  if (!match) return '';
  const lines = text.slice(0, Number(match[1])).split('\n');
  return ` (line ${lines.length}, column ${lines[lines.length - 1].length + 1})`;
}

export function parseJsonText(text: string): JsonTextResult {
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  try {
    return { ok: true, json: JSON.parse(body) as unknown };
  } catch (error) {
    const message = error instanceof Error ? error.message : String(error);
    // The parser's message quotes the file's text: escape it, as a message shows any id.
    return { ok: false, message: `not valid JSON: ${escapeUnprintable(message)}${lineAndColumn(body, message)}` };
  }
}
