/**
 * The checkpoint file store (src/engine/node/fileCheckpointStore.ts) on real temporary
 * folders: what a kill at any step of a save leaves, what a damaged or missing newest
 * file does to a resume and to the saves after it, and what is left behind.
 *
 * A kill is played by a file-system double over the real folder: the first K steps run
 * for real, step K is cut off (a write leaves half its text, as a kill during a write
 * can), and every step after it fails, clean-up included, as nothing runs after a kill.
 * The checkpoints are real ones (island states of real Rosenbrock islands, in this
 * thread), so "verifies" means what it means in use: the text decodes, checksum included.
 */
import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeAll, describe, expect, it } from 'vitest';
import { CHECKPOINT_VERSION, decodeCheckpoint, defineRun, encodeCheckpoint, planIslands, restoreRunFromStore, type RunSpec } from '../../src/engine';
import { fileCheckpointStore, nodeEnvironment, nodeFileOps, type FileOps } from '../../src/engine/node';
import { createSearchWorkerApi } from '../../workers/searchWorkerApi';

const made = defineRun({
  jobs: [{ id: 'rosenbrock', objective: { kind: 'test-function', name: 'rosenbrock', dim: 4 }, seed: 3, islands: 2 }],
  budget: { evaluations: 20_000 },
  deterministic: true,
});
if (!made.ok) throw new Error(made.reason);
const SPEC: RunSpec = made.spec;

/** A real checkpoint of SPEC after `rounds` rounds of 200 evaluations per island. */
function checkpointText(rounds: number): string {
  const api = createSearchWorkerApi(() => 0);
  const islands = planIslands(SPEC).map((plan) => {
    const init = api.init({
      islandId: plan.islandId,
      objective: plan.job.objective,
      seed: plan.job.seed,
      stream: plan.stream,
      optimizer: plan.job.optimizer,
      maxEvaluations: plan.maxEvaluations,
      archiveCapacity: SPEC.archive.capacity,
      archiveDistance: SPEC.archive.distance,
    });
    if (!init.ok) throw new Error(init.reason);
    if (rounds > 0) api.advance([{ islandId: plan.islandId, slice: { evaluations: 200 * rounds }, immigrants: [], emigrants: 0, publish: false }]);
    const exported = api.exportState(plan.islandId);
    if (!exported.ok) throw new Error(exported.reason);
    return exported.state;
  });
  const evaluations = islands.reduce((sum, island) => sum + island.optimizer.evaluations, 0);
  return encodeCheckpoint({ spec: SPEC, rounds, elapsedMs: rounds * 100, evaluations, restarts: 0, islands, archive: [{ jobId: 'rosenbrock', entries: [] }] });
}

/** The round a checkpoint text is of, or null if it does not decode. */
function roundOf(text: string | undefined): number | null {
  if (text === undefined) return null;
  const decoded = decodeCheckpoint(text);
  return decoded.ok ? decoded.payload.rounds : null;
}

let A = '';
let B = '';
let C = '';
let D = '';
beforeAll(() => {
  [A, B, C, D] = [1, 2, 3, 4].map(checkpointText);
});

const dirs: string[] = [];
function freshDir(): string {
  const dir = mkdtempSync(join(tmpdir(), 'loci-ckfile-'));
  dirs.push(dir);
  return dir;
}
afterEach(() => {
  for (const dir of dirs.splice(0)) rmSync(dir, { recursive: true, force: true });
});

const tmpFiles = (dir: string) => readdirSync(dir).filter((name) => name.endsWith('.tmp'));

class Killed extends Error {}

/** The real file steps, with a kill at step `killAt` (0-based); `steps` counts the steps asked for. */
function killingOps(killAt: number, base: FileOps = nodeFileOps): FileOps & { readonly steps: number } {
  let steps = 0;
  const gate = () => {
    const k = steps++;
    if (k > killAt) throw new Killed('after the kill');
    return k === killAt;
  };
  return {
    get steps() {
      return steps;
    },
    async writeDurably(path, text) {
      if (gate()) {
        await writeFile(path, text.slice(0, Math.floor(text.length / 2)));
        throw new Killed('killed while writing');
      }
      return base.writeDurably(path, text);
    },
    async readText(path) {
      if (gate()) throw new Killed('killed');
      return base.readText(path);
    },
    async link(from, to) {
      if (gate()) throw new Killed('killed');
      return base.link(from, to);
    },
    async rename(from, to) {
      if (gate()) throw new Killed('killed');
      return base.rename(from, to);
    },
    async remove(path) {
      if (gate()) throw new Killed('killed');
      return base.remove(path);
    },
    async list(dir) {
      if (gate()) throw new Killed('killed');
      return base.list(dir);
    },
    async syncDir(dir) {
      if (gate()) throw new Killed('killed');
      return base.syncDir(dir);
    },
  };
}

/** The real steps on a file system without hard links (link fails as it does there). */
const noHardLinks: FileOps = {
  ...nodeFileOps,
  link: () => Promise.reject(Object.assign(new Error('operation not permitted'), { code: 'EPERM' })),
};

describe('the checkpoint file store', () => {
  it('keeps the newest in FILE and the one before in FILE.prev, and leaves no temporary file', async () => {
    const dir = freshDir();
    const path = join(dir, 'ck.json');
    const store = fileCheckpointStore(path);
    expect(await store.load()).toEqual([]);
    await store.save(A);
    expect((await store.load()).map(roundOf)).toEqual([1]);
    await store.save(B);
    await store.save(C);
    const listed = await store.list!();
    expect(listed.found.map((f) => [f.source, roundOf(f.text)])).toEqual([[path, 3], [`${path}.prev`, 2]]);
    expect(listed.notes).toEqual([]);
    expect(readdirSync(dir).sort()).toEqual(['ck.json', 'ck.json.prev']);
  });

  for (const [name, base] of [['with hard links', nodeFileOps], ['without hard links (plain rename)', noHardLinks]] as const) {
    it(`survives a kill at every step of a save, ${name}: each file left is whole, and FILE.prev is never cut short`, async () => {
      // How many steps a whole save takes, counted on a real folder.
      const counting = killingOps(Number.MAX_SAFE_INTEGER, base);
      const countDir = freshDir();
      await fileCheckpointStore(join(countDir, 'ck.json'), { ops: base }).save(A);
      await fileCheckpointStore(join(countDir, 'ck.json'), { ops: counting }).save(B);
      const total = counting.steps;
      expect(total).toBeGreaterThanOrEqual(4);

      for (let killAt = 0; killAt <= total; killAt++) {
        const dir = freshDir();
        const path = join(dir, 'ck.json');
        const before = fileCheckpointStore(path, { ops: base });
        await before.save(A);
        await before.save(B);
        const killed = killingOps(killAt, base);
        const saving = fileCheckpointStore(path, { ops: killed }).save(C);
        if (killAt < total) await expect(saving).rejects.toBeInstanceOf(Killed);
        else await saving;

        // The next run: what it finds must verify, newest first, and be C or B; the one before, B or A.
        const after = fileCheckpointStore(path, { ops: base });
        const listed = await after.list!();
        const rounds = listed.found.map((f) => roundOf(f.text));
        expect(rounds.every((r) => r !== null), `kill at step ${killAt}: ${JSON.stringify(rounds)}`).toBe(true);
        expect([2, 3]).toContain(rounds[0]);
        if (rounds.length > 1) expect(rounds[1]).toBeLessThanOrEqual(rounds[0]!);
        if (listed.found[0].source !== path) expect(listed.notes.join('\n')).toMatch(/ck\.json is missing/);
        // A temporary file the kill left is removed, and said so.
        expect(tmpFiles(dir), `kill at step ${killAt}`).toEqual([]);
        // And saving goes on from there: the newest becomes FILE.prev.
        await after.save(D);
        const again = (await after.list!()).found.map((f) => roundOf(f.text));
        expect(again).toEqual([4, rounds[0]]);
        expect(tmpFiles(dir)).toEqual([]);
      }
    });
  }

  it('says so when it removes a temporary file an interrupted save left (a 0-byte one included)', async () => {
    const dir = freshDir();
    const path = join(dir, 'ck.json');
    const store = fileCheckpointStore(path);
    await store.save(A);
    writeFileSync(join(dir, 'ck.json.4242.tmp'), '');
    writeFileSync(join(dir, 'ck.json.prev.4242.tmp'), A.slice(0, 100));
    writeFileSync(join(dir, 'ck.json.notes.tmp'), 'not ours');
    const listed = await fileCheckpointStore(path).list!();
    expect(listed.notes).toHaveLength(2);
    expect(listed.notes[0]).toMatch(/removed .*ck\.json\.4242\.tmp, a temporary file an interrupted save left/);
    expect(readdirSync(dir).sort()).toEqual(['ck.json', 'ck.json.notes.tmp']);
  });

  const DAMAGE: readonly [string, (text: string) => string, RegExp][] = [
    ['cut short', (t) => t.slice(0, Math.floor(t.length / 2)), /not valid JSON/],
    ['empty (0 bytes)', () => '', /not valid JSON/],
    ['a digit changed', (t) => t.replace(/"rounds":(\d+)/, (_, n: string) => `"rounds":${Number(n) + 7}`), /corrupt.*checksum/],
    ['not JSON at all', () => '\u0000\u0001garbage\u00ff', /not valid JSON/],
    ['another format', (t) => t.replace('"loci-run-checkpoint"', '"something-else"'), /format/],
    ['a later version', (t) => t.replace(`"version":${CHECKPOINT_VERSION}`, '"version":99'), /version/],
  ];

  for (const [kind, damage, reason] of DAMAGE) {
    it(`resumes from FILE.prev when FILE is ${kind}, names it, and never promotes the damaged FILE over it`, async () => {
      const dir = freshDir();
      const path = join(dir, 'ck.json');
      const store = fileCheckpointStore(path);
      await store.save(A);
      await store.save(B);
      writeFileSync(path, damage(readFileSync(path, 'utf8')));

      const restored = await restoreRunFromStore(nodeEnvironment(), fileCheckpointStore(path));
      if (!restored.ok) throw new Error(restored.reason);
      expect(restored.source).toBe(`${path}.prev`);
      expect(restored.run.progress().rounds).toBe(1);
      expect(restored.passedOver).toHaveLength(1);
      expect(restored.passedOver[0].source).toBe(path);
      expect(restored.passedOver[0].reason).toMatch(reason);

      // The resumed run saves: the damaged newest is replaced, the good FILE.prev stays.
      const resumed = fileCheckpointStore(path);
      await resumed.save(C);
      expect(roundOf(readFileSync(`${path}.prev`, 'utf8'))).toBe(1);
      expect(roundOf(readFileSync(path, 'utf8'))).toBe(3);
      // Once the newest verifies again, it is promoted as usual.
      await resumed.save(D);
      expect([roundOf(readFileSync(path, 'utf8')), roundOf(readFileSync(`${path}.prev`, 'utf8'))]).toEqual([4, 3]);
      expect(tmpFiles(dir)).toEqual([]);
    });
  }

  it('resumes from FILE.prev when FILE is missing, and says FILE is missing', async () => {
    const dir = freshDir();
    const path = join(dir, 'ck.json');
    const store = fileCheckpointStore(path);
    await store.save(A);
    await store.save(B);
    rmSync(path);
    const restored = await restoreRunFromStore(nodeEnvironment(), fileCheckpointStore(path));
    if (!restored.ok) throw new Error(restored.reason);
    expect(restored.source).toBe(`${path}.prev`);
    expect(restored.passedOver).toEqual([]);
    expect(restored.notes.join('\n')).toMatch(/ck\.json is missing/);
  });

  it('reports a folder that cannot be written as a failed save, leaving nothing behind', async () => {
    const dir = freshDir();
    // A regular file where the folder should be: no one, root included, can create files under it.
    writeFileSync(join(dir, 'not-a-folder'), '');
    const store = fileCheckpointStore(join(dir, 'not-a-folder', 'ck.json'));
    await expect(store.save(A)).rejects.toMatchObject({ code: 'ENOTDIR' });
    expect(readdirSync(dir)).toEqual(['not-a-folder']);
  });
});
