/**
 * A CSV read back by a general-purpose reader (papaparse), apart from Loci's own writers:
 * RFC 4180 fields, quoted fields holding commas, doubled quotes and line breaks.
 */
import Papa from 'papaparse';

export function readCsv(text: string): string[][] {
  const parsed = Papa.parse<string[]>(text, { newline: '\r\n', skipEmptyLines: true });
  if (parsed.errors.length > 0) throw new Error(`the CSV does not read: ${parsed.errors.map((e) => `row ${e.row}: ${e.message}`).join('; ')}`);
  return parsed.data;
}
