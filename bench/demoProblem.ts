/**
 * The app's demo target as a problem file for one family: 24 points, closed, unprescribed
 * timing with `samples` curve samples, free placement, RMS — the search a user starts from
 * the demo, as the benches run it.
 */
import { demoTargetPoints } from '../src/app/demo/transferDemo';
import type { FamilyId } from '../src/core/synthesis';

export function demoProblemFile(family: FamilyId, samples: number) {
  return {
    format: 'loci-problem',
    version: 1,
    name: 'demo-transfer',
    target: { points: demoTargetPoints().map((p) => [p.x, p.y]), closed: true },
    timing: { mode: 'unprescribed', samples },
    placement: 'free',
    families: [family],
    measure: 'rms',
  };
}
