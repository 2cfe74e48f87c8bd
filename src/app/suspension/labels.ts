/** Joint ids in words for tables and the side view: `rockerStayPin` → "rocker stay pin". */
export function pivotLabel(id: string): string {
  return id.replace(/([a-z])([A-Z])/g, '$1 $2').toLowerCase();
}

/** A file name from a design name: letters, digits and dashes only. */
export function fileStem(name: string): string {
  const stem = name.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 60);
  return stem === '' ? 'suspension' : stem;
}

/** A figure as shown on the page: four significant figures. */
export function figure(x: number, digits = 4): string {
  return Number.isFinite(x) ? String(Number(x.toPrecision(digits))) : '—';
}
