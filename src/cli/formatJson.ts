/**
 * JSON for people and for programs alike: objects indented one key a line, while an
 * array of numbers (or of short number arrays, such as a path of [x, y] pairs) stays on
 * one line, so a 361-step path is one line, not 1083.
 *
 * Every number prints in full: the shortest decimal that reads back to the same double.
 * Rounding to a fixed count of significant digits loses what a user needs to rebuild a
 * figure (a joint placed at 1e7 mm loses 0.07 mm at 9 digits), and no fixed absolute
 * floor suits both micrometre offsets and kilometre frames.
 */
export function formatJson(value: unknown): string {
  return format(value, '');
}

function isInline(value: unknown): boolean {
  if (value === null || typeof value !== 'object') return true;
  if (!Array.isArray(value)) return false;
  return value.every((v) => v === null || typeof v !== 'object' || (Array.isArray(v) && v.every((w) => w === null || typeof w !== 'object')));
}

function format(value: unknown, indent: string): string {
  if (typeof value === 'number') return Number.isFinite(value) ? JSON.stringify(value) : 'null';
  if (value === null || typeof value !== 'object') return JSON.stringify(value) ?? 'null';
  if (Array.isArray(value)) {
    if (value.length === 0) return '[]';
    if (isInline(value)) return `[${value.map((v) => format(v, '')).join(', ')}]`;
    const inner = `${indent}  `;
    return `[\n${value.map((v) => inner + format(v, inner)).join(',\n')}\n${indent}]`;
  }
  const entries = Object.entries(value).filter(([, v]) => v !== undefined);
  if (entries.length === 0) return '{}';
  const inner = `${indent}  `;
  const lines = entries.map(([k, v]) => `${inner}${JSON.stringify(k)}: ${format(v, inner)}`);
  return `{\n${lines.join(',\n')}\n${indent}}`;
}
