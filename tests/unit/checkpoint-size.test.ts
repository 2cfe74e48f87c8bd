/**
 * Smaller checkpoints (island state version 3, checkpoint version 2): the optimizer
 * state is packed (src/core/optimize/packedState.ts), exactly, and checkpoints of the
 * version before still restore bit for bit.
 *
 * tests/fixtures/checkpoint-v1.json is a checkpoint of version 1 (island states of
 * version 2) written by Loci at commit d0f4fbf, before this change: two Rosenbrock islands
 * running the hybrid inside the restart scheme, past a restart that grew the population.
 * tests/fixtures/checkpoint-v1.continued.json is what that code computed from it: each
 * island restored, then four rounds of migration and 1500-evaluation steps.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { decodeCheckpoint, encodeCheckpoint, CHECKPOINT_VERSION, type CheckpointPayload } from '../../src/engine';
import { bytesToBase64, base64ToBytes, base64ToDoubles, doublesToBase64 } from '../../src/core/optimize/base64';
import { createOptimizer, packState, Prng, unpackState, type Optimizer, type OptimizerConfig, type OptimizerState } from '../../src/core/optimize';
import { ISLAND_STATE_VERSION, type IslandState } from '../../workers/api';
import { Island } from '../../workers/island';

const fixture = (name: string): string => readFileSync(new URL(`../fixtures/${name}`, import.meta.url), 'utf8');
const noClock = (): number => 0;

function decoded(text: string): CheckpointPayload {
  const result = decodeCheckpoint(text);
  if (!result.ok) throw new Error(result.reason);
  return result.payload;
}

function restored(state: IslandState): Island {
  const made = Island.restore(state);
  if (!made.ok) throw new Error(made.reason);
  return made.island;
}

/** The fixture's continuation, as its recording did it: rounds of migration (each island takes the other's two best) and steps. */
function continueIslands(islands: readonly Island[]): unknown[] {
  const out: unknown[] = [];
  for (let r = 0; r < 4; r++) {
    const sent = islands.map((island) => island.emigrants(2));
    islands.forEach((island, k) => {
      const accepted = island.immigrate(sent[(k + 1) % 2]);
      const progress = island.step({ evaluations: 1500 }, noClock);
      out.push({ accepted, progress: { ...progress, stepMs: 0 } });
    });
  }
  out.push({ emigrants: islands.map((island) => island.emigrants(4)) });
  return out;
}

describe('a checkpoint of the version before (fixture)', () => {
  const text = fixture('checkpoint-v1.json');

  it('decodes, and its islands (version 2) continue to what the code that wrote it computed', () => {
    const payload = decoded(text);
    expect(JSON.parse(text).version).toBe(1);
    expect(payload.islands.map((island) => island.version as number)).toEqual([2, 2]);
    // Source: the recording made with the fixture by Loci at d0f4fbf (see the header).
    const recorded: unknown = JSON.parse(fixture('checkpoint-v1.continued.json'));
    expect(continueIslands(payload.islands.map(restored))).toEqual(recorded);
  });

  it('saved again in the new version, continues exactly as it does', () => {
    const payload = decoded(text);
    const islands = payload.islands.map(restored);
    const resaved = encodeCheckpoint({ ...payload, islands: islands.map((island) => island.exportState()) });
    expect(JSON.parse(resaved).version).toBe(CHECKPOINT_VERSION);
    const again = decoded(resaved);
    expect(again.islands.map((island) => island.version)).toEqual([ISLAND_STATE_VERSION, ISLAND_STATE_VERSION]);
    expect(continueIslands(again.islands.map(restored))).toEqual(continueIslands(payload.islands.map(restored)));
    // Source: arithmetic — 8 bytes are 10⅔ base64 characters; a double of the box with 16 or 17
    // significant digits is 18 to 20 decimal ones with its comma. The rest of the checkpoint
    // (spec, the islands' archives in design units) is as before.
    payload.islands.forEach((island, k) => {
      expect(JSON.stringify(again.islands[k].optimizer).length).toBeLessThan(0.6 * JSON.stringify(island.optimizer).length);
    });
    expect(resaved.length).toBeLessThan(0.7 * text.length);
  });

  it('its optimizer states pack and unpack to the same JSON, key order included', () => {
    for (const island of decoded(text).islands) {
      const plain = island.optimizer as OptimizerState;
      const unpacked = unpackState(JSON.parse(JSON.stringify(packState(plain))));
      if (!unpacked.ok) throw new Error(unpacked.reason);
      expect(JSON.stringify(unpacked.state)).toBe(JSON.stringify(plain));
    }
  });
});

describe('packing an optimizer state', () => {
  const evaluate = (u: ArrayLike<number>) => {
    // Rosenbrock's function on [−2, 2]^5 (Jamil and Yang, 2013), a failed corner (NaN) and a constraint.
    if (u[4] > 0.9) return { value: Number.NaN, violation: 0 };
    let value = 0;
    for (let j = 0; j + 1 < u.length; j++) {
      const a = 4 * u[j] - 2;
      const b = 4 * u[j + 1] - 2;
      value += 100 * (b - a * a) ** 2 + (1 - a) ** 2;
    }
    return { value, violation: Math.max(0, u[0] - 0.9) };
  };

  /** Runs `opt` for `batches` batches, checking after each that its packed state, through JSON, unpacks to its exported state. */
  function checkAlong(config: OptimizerConfig, batches: number): void {
    const made = createOptimizer(config);
    if (!made.ok) throw new Error(made.reason);
    const opt: Optimizer = made.optimizer;
    for (let b = 0; b <= batches && !opt.done(); b++) {
      const plain = opt.exportState();
      const unpacked = unpackState(JSON.parse(JSON.stringify(packState(plain))));
      if (!unpacked.ok) throw new Error(unpacked.reason);
      expect(JSON.stringify(unpacked.state)).toBe(JSON.stringify(plain));
      const points = opt.ask();
      const values = new Float64Array(points.length);
      const violations = new Float64Array(points.length);
      points.forEach((p, k) => ({ value: values[k], violation: violations[k] } = evaluate(p)));
      opt.tell(points, values, violations);
    }
  }

  it('is exact for every kind, in every phase (initial population, evolution, polish, restarts, stopped)', () => {
    const common = { dim: 5, seed: 3 } as const;
    checkAlong({ kind: 'lshade', maxEvaluations: 3000, ...common }, 100);
    checkAlong({ kind: 'de-rand-1-bin', maxEvaluations: 1500, ...common }, 100);
    checkAlong({ kind: 'nelder-mead', maxEvaluations: 200, ...common }, 200);
    checkAlong({ kind: 'hybrid', maxEvaluations: 3000, ...common }, 400);
    checkAlong({ kind: 'restart', inner: { kind: 'hybrid' }, runEvaluations: 1000, maxEvaluations: 4000, ...common }, 600);
  });

  it('leaves a state with nothing long plain, and a plain state unpacks to itself', () => {
    const made = createOptimizer({ kind: 'nelder-mead', dim: 2, maxEvaluations: 50, seed: 1 });
    if (!made.ok) throw new Error(made.reason);
    const plain = made.optimizer.exportState();
    expect(packState(plain)).toEqual(plain);
    expect(unpackState(plain)).toEqual({ ok: true, state: plain });
  });

  it('refuses damaged packing, saying where and what', () => {
    expect(unpackState({ population: { f64: 'AAAA' } })).toEqual({ ok: false, reason: 'state.population.f64: base64 text of 3 bytes; expected a multiple of 8 (doubles)' });
    expect(unpackState({ population: { f64: 'AAA*AAAAAAA=' } })).toEqual({
      ok: false,
      reason: 'state.population.f64: base64 text has "*" at 3; expected A–Z, a–z, 0–9, + or / (= only at the end)',
    });
    const nan = doublesToBase64(1, () => Number.NaN);
    expect(unpackState({ values: [{ f64: nan }] })).toEqual({ ok: false, reason: 'state.values[0].f64[0] is NaN; expected a number or +Infinity (null)' });
  });
});

describe('base64 of doubles', () => {
  it('encodes bytes as RFC 4648 does', () => {
    // Source: S. Josefsson, RFC 4648 "The Base16, Base32, and Base64 Data Encodings", 2006, §10 test vectors.
    const vectors: [string, string][] = [['', ''], ['f', 'Zg=='], ['fo', 'Zm8='], ['foo', 'Zm9v'], ['foob', 'Zm9vYg=='], ['fooba', 'Zm9vYmE='], ['foobar', 'Zm9vYmFy']];
    for (const [plain, encoded] of vectors) {
      const bytes = Uint8Array.from(plain, (c) => c.charCodeAt(0));
      expect(bytesToBase64(bytes)).toBe(encoded);
      expect(base64ToBytes(encoded)).toEqual(bytes);
    }
  });

  it("matches Node's Buffer (a second, independent implementation) on random bytes and doubles, every double exact", () => {
    const rng = Prng.fromSeed(99);
    for (let trial = 0; trial < 30; trial++) {
      const n = rng.int(3000);
      const bytes = new Uint8Array(n);
      for (let k = 0; k < n; k++) bytes[k] = rng.int(256);
      const text = bytesToBase64(bytes);
      // Source: Node.js Buffer, base64 encoding (RFC 4648 with padding).
      expect(text).toBe(Buffer.from(bytes).toString('base64'));
      expect(base64ToBytes(text)).toEqual(bytes);
    }
    const special = [0, -0, 5e-324, -5e-324, 2.2250738585072014e-308, Number.MAX_VALUE, -Number.MAX_VALUE, Infinity, -Infinity, Number.NaN, 1 / 3, 0.1];
    const doubles = [...special, ...Array.from({ length: 1000 }, () => rng.float())];
    const text = doublesToBase64(doubles.length, (k) => doubles[k]);
    const reference = Buffer.alloc(doubles.length * 8);
    doubles.forEach((x, k) => reference.writeDoubleLE(x, k * 8));
    expect(text).toBe(reference.toString('base64'));
    const back = base64ToDoubles(text);
    if (typeof back === 'string') throw new Error(back);
    // Object.is tells −0 from 0 and NaN from any number: the bits come back.
    doubles.forEach((x, k) => expect(Object.is(back[k], x)).toBe(true));
  });
});
