/**
 * JSON for people and for programs alike: objects indented one key a line, while an
 * array of numbers (or of short number arrays, such as a path of [x, y] pairs) stays on
 * one line, so a 361-step path is one line, not 1083.
 *
 * Numbers keep `significantDigits` significant digits (9: a nanometre at a metre) and
 * print as 0 below `zeroBelow` in magnitude (1e-9: rounding noise such as 30 cos 90° =
 * 1.8e-15 mm), except under the keys in `exactKeys` (a closure residual of 1.4e-14 mm is
 * the figure itself), which print every digit.
 */
export interface FormatJsonOptions {
  readonly significantDigits: number;
  readonly zeroBelow: number;
  readonly exactKeys: readonly string[];
}

const DEFAULT_FORMAT: FormatJsonOptions = { significantDigits: 9, zeroBelow: 1e-9, exactKeys: [] };

export function formatJson(value: unknown, options: Partial<FormatJsonOptions> = {}): string {
  const opts = { ...DEFAULT_FORMAT, ...options };
  return format(value, '', opts, false);
}

function isInline(value: unknown): boolean {
  if (value === null || typeof value !== 'object') return true;
  if (!Array.isArray(value)) return false;
  return value.every((v) => v === null || typeof v !== 'object' || (Array.isArray(v) && v.every((w) => w === null || typeof w !== 'object')));
}

function format(value: unknown, indent: string, opts: FormatJsonOptions, exact: boolean): string {
  if (typeof value === 'number') return formatNumber(value, opts, exact);
  if (value === null || typeof value !== 'object') return JSON.stringify(value) ?? 'null';
  if (Array.isArray(value)) {
    if (value.length === 0) return '[]';
    if (isInline(value)) return `[${value.map((v) => format(v, '', opts, exact)).join(', ')}]`;
    const inner = `${indent}  `;
    return `[\n${value.map((v) => inner + format(v, inner, opts, exact)).join(',\n')}\n${indent}]`;
  }
  const entries = Object.entries(value).filter(([, v]) => v !== undefined);
  if (entries.length === 0) return '{}';
  const inner = `${indent}  `;
  const lines = entries.map(([k, v]) => `${inner}${JSON.stringify(k)}: ${format(v, inner, opts, exact || opts.exactKeys.includes(k))}`);
  return `{\n${lines.join(',\n')}\n${indent}}`;
}

function formatNumber(value: number, opts: FormatJsonOptions, exact: boolean): string {
  if (!Number.isFinite(value)) return 'null';
  if (exact) return JSON.stringify(value);
  if (Math.abs(value) < opts.zeroBelow) return '0';
  return JSON.stringify(Number(value.toPrecision(opts.significantDigits)));
}
