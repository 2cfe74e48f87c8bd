/**
 * Linkage files built to stress the reader, the compiler and `loci analyze`: the
 * reproducers of the "hostile input" issue, written out here from its text.
 */

export interface LinkageJson {
  format: string;
  version: number;
  units: string;
  name?: string;
  joints: { id: string; x: number; y: number; ground?: boolean }[];
  bodies: { id: string; joints: string[] }[];
  points?: { id: string; body: string; x: number; y: number }[];
  sliders?: { joint: string; body: string; angle: number }[];
  driver: { kind: 'rotation'; body: string; pivot: string; tip: string } | { kind: 'length'; from: string; to: string };
}

/**
 * The crank-rocker of public/examples/crank-rocker.json (ground 90, crank 30, coupler
 * ≈ 85.0, rocker ≈ 70.0 mm): Grashof, its crank turns fully.
 */
export function crankRocker(): LinkageJson {
  return {
    format: 'loci-linkage', version: 1, units: 'mm',
    joints: [
      { id: 'O2', x: 0, y: 0, ground: true },
      { id: 'A', x: 0, y: 30 },
      { id: 'B', x: 76, y: 68 },
      { id: 'O4', x: 90, y: 0, ground: true },
    ],
    bodies: [
      { id: 'crank', joints: ['O2', 'A'] },
      { id: 'coupler', joints: ['A', 'B'] },
      { id: 'rocker', joints: ['B', 'O4'] },
    ],
    driver: { kind: 'rotation', body: 'crank', pivot: 'O2', tip: 'A' },
  };
}

/** The crank-rocker with `count` named points on its coupler, spread over a 100 mm square. */
export function pointsOnCoupler(count: number): LinkageJson {
  const file = crankRocker();
  file.points = Array.from({ length: count }, (_, i) => ({ id: `P${i}`, body: 'coupler', x: 20 + (i % 100), y: 60 + Math.floor(i / 100) % 100 }));
  return file;
}

/**
 * A crank followed by `dyads` dyads in a chain: dyad k joins the previous moving joint
 * and a new ground pivot G_k through two binary links meeting at C_k. Mobility
 * 3(2N + 1) − 2(3N + 1) = 1; every dyad is about 90° from its dead centre in the
 * reference pose. Its four-bar loops are exactly N: (ground, crank, L1, R1), then
 * (ground, R_{k−1}, L_k, R_k) for each later dyad.
 */
export function dyadChain(dyads: number): LinkageJson {
  const joints: LinkageJson['joints'] = [
    { id: 'O', x: 0, y: 0, ground: true },
    { id: 'C0', x: 0, y: 20 },
  ];
  const bodies: LinkageJson['bodies'] = [{ id: 'crank', joints: ['O', 'C0'] }];
  for (let k = 1; k <= dyads; k++) {
    joints.push({ id: `C${k}`, x: 60 * k, y: 20 + 10 * (k % 2) }, { id: `G${k}`, x: 60 * k, y: -50, ground: true });
    bodies.push({ id: `L${k}`, joints: [`C${k - 1}`, `C${k}`] }, { id: `R${k}`, joints: [`G${k}`, `C${k}`] });
  }
  return { format: 'loci-linkage', version: 1, units: 'mm', joints, bodies, driver: { kind: 'rotation', body: 'crank', pivot: 'O', tip: 'C0' } };
}

/** The crank-rocker with `count` ground joints that no body carries. */
export function unusedGroundJoints(count: number): LinkageJson {
  const file = crankRocker();
  for (let i = 0; i < count; i++) file.joints.push({ id: `U${i}`, x: i % 1000, y: -10 - Math.floor(i / 1000), ground: true });
  return file;
}

/**
 * The text of a linkage file whose `count` points all name a body that does not exist,
 * built by repetition so a test does not build millions of objects.
 */
export function invalidPointsText(count: number): string {
  const head = JSON.stringify(crankRocker()).slice(0, -1);
  const point = '{"id":"p","body":"nowhere","x":0,"y":0}';
  return `${head},"points":[${`${point},`.repeat(count - 1)}${point}]}`;
}
