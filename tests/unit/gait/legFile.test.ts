/**
 * The leg design file (format "loci-leg"): what toLegFile writes, parseLegFile reads back
 * unchanged, through JSON text; the envelope and the linkage's own issues are named.
 */
import { describe, expect, it } from 'vitest';
import { DEMO_TOY_LEG, DEMO_TOY_LEG_LINKAGE, GAIT_CAUTION, type LegSpec } from '../../../src/core/gait';
import { LEG_FILE_FORMAT, parseLegFile, parseLegFileText, toLegFile } from '../../../src/core/io/legFile';

describe('leg file', () => {
  it('reads back what it writes: sloping ground, trajectory and phases included', () => {
    const leg: LegSpec = {
      ...DEMO_TOY_LEG,
      ground: { kind: 'line', point: { x: 1.5, y: -30.9 }, direction: { x: 10, y: 0.3 } },
      footPath: [{ x: 0, y: -30 }, { x: 10, y: -30.5 }, { x: 5, y: -22 }],
    };
    const design = { name: 'toy, sloping', linkage: DEMO_TOY_LEG_LINKAGE, leg, phased: { legs: 2, phasesDeg: [0, 180] } };
    const file = toLegFile(design);
    expect(file.format).toBe(LEG_FILE_FORMAT);
    const read = parseLegFileText(JSON.stringify(file, null, 2));
    expect(read.ok).toBe(true);
    if (read.ok) expect(read.design).toEqual(design);
  });

  // The mission's rule: every export of a design that can hurt someone says Loci computes kinematics only.
  it('carries the walking-machine caution, and reads a file with or without it', () => {
    const design = { linkage: DEMO_TOY_LEG_LINKAGE, leg: DEMO_TOY_LEG };
    const file = toLegFile(design);
    expect(file.caution).toBe(GAIT_CAUTION);
    const { caution: _dropped, ...without } = file;
    const read = parseLegFile(without);
    expect(read.ok).toBe(true);
    const tooLong = parseLegFile({ ...file, caution: 'x'.repeat(5000) });
    expect(tooLong.ok).toBe(false);
    if (!tooLong.ok) expect(tooLong.issues[0]!.path).toBe('caution');
  });

  it('names what is wrong: envelope, units, the linkage inside it', () => {
    const good = toLegFile({ linkage: DEMO_TOY_LEG_LINKAGE, leg: DEMO_TOY_LEG });
    const cases: [unknown, string, RegExp][] = [
      [{ ...good, format: 'loci-linkage' }, 'format', /expected "loci-leg"/],
      [{ ...good, units: 'in' }, 'units', /"mm"/],
      [{ ...good, linkage: { ...(good.linkage as object), format: 'other' } }, 'linkage.format', /loci-linkage/],
      [{ ...good, footPath: [[0, 1, 2]] }, 'footPath[0]', /point \[x mm, y mm\]/],
      [{ ...good, phased: { legs: 2 } }, 'phased.phasesDeg', /phases in degrees/],
    ];
    for (const [json, path, message] of cases) {
      const r = parseLegFile(json);
      expect(r.ok, path).toBe(false);
      if (r.ok) continue;
      expect(r.issues[0].path).toBe(path);
      expect(r.issues[0].message).toMatch(message);
    }
    expect(parseLegFileText('{').ok).toBe(false);
  });
});
