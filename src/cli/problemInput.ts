/** Reading a problem file for `loci fit` and `loci check`: the file, its JSON, then parseSynthesisProblemFile. */
import { parseJsonText } from '../core/io/jsonText';
import { MAX_PROBLEM_FILE_CHARS, parseSynthesisProblemFile } from '../core/io/problem';
import type { SynthesisProblem } from '../core/synthesis';
import type { CliIo } from './command';

export type ReadProblemResult =
  | { readonly ok: true; readonly json: unknown; readonly problem: SynthesisProblem; readonly description?: string }
  /** Each line names the file and, where there is one, the field. */
  | { readonly ok: false; readonly lines: string[] };

export async function readProblemFile(path: string, io: CliIo): Promise<ReadProblemResult> {
  const read = await io.readTextFile(path);
  if (!read.ok) return { ok: false, lines: [read.message] };
  if (read.text.length > MAX_PROBLEM_FILE_CHARS) {
    const kb = Math.round(read.text.length / 1000).toLocaleString('en-GB');
    return { ok: false, lines: [`${path}: the file is ${kb} kB; a problem file may be at most ${(MAX_PROBLEM_FILE_CHARS / 1000).toLocaleString('en-GB')} kB`] };
  }
  const text = parseJsonText(read.text);
  if (!text.ok) return { ok: false, lines: [`${path}: ${text.message}`] };
  const json = text.json;
  const parsed = parseSynthesisProblemFile(json);
  if (!parsed.ok) {
    return { ok: false, lines: parsed.issues.map((issue) => `${path}: ${issue.path === '' ? '' : `${issue.path}: `}${issue.message}`) };
  }
  return parsed.description === undefined
    ? { ok: true, json, problem: parsed.problem }
    : { ok: true, json, problem: parsed.problem, description: parsed.description };
}
