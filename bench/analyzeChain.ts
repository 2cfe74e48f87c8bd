/**
 * `loci analyze` of long dyad chains (the last hang of the issue "Hostile input and
 * faults"): wall seconds of analyzeLinkage (compile and JSON output left out) for chains
 * of 200, 400 and 1,000 dyads built as tests/unit/hostileLinkages.ts builds them, and the
 * ratio of 1,000 to 200. Linear work gives about 5; work that grows as the square of the
 * length, 25. The checksum is the 1,000-dyad report's first dead centre (deg).
 */
import { performance } from 'node:perf_hooks';
import { readLinkageFile } from '../src/core/io/linkageFile';
import { analyzeLinkage } from '../src/core/linkage/report';
import { dyadChain } from '../tests/unit/hostileLinkages';

function analyzeS(dyads: number): { seconds: number; firstDeadCentreDeg: number } {
  const parsed = readLinkageFile(dyadChain(dyads));
  if (!parsed.ok) throw new Error(`the ${dyads}-dyad chain does not compile: ${JSON.stringify(parsed.issues)}`);
  const start = performance.now();
  const result = analyzeLinkage(parsed.plan);
  const seconds = (performance.now() - start) / 1000;
  if (!result.ok) throw new Error(`analyze of the ${dyads}-dyad chain failed: ${JSON.stringify(result.issues)}`);
  return { seconds, firstDeadCentreDeg: result.report.defects.deadCentres[0]?.at ?? NaN };
}

export function benchAnalyzeChain(): Promise<Record<string, number>> {
  analyzeS(50); // warm-up
  const s200 = analyzeS(200);
  const s400 = analyzeS(400);
  const s1000 = analyzeS(1000);
  return Promise.resolve({
    chain200AnalyzeS: s200.seconds,
    chain400AnalyzeS: s400.seconds,
    chain1000AnalyzeS: s1000.seconds,
    chain1000Over200TimeRatio: s1000.seconds / s200.seconds,
    firstDeadCentreDegChecksum: s1000.firstDeadCentreDeg,
  });
}
