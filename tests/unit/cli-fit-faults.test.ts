/**
 * `loci fit` when its files and its process are not treated kindly: --out and
 * --checkpoint paths it cannot write, --checkpoint-every, a damaged or missing
 * checkpoint, SIGTERM, and files that become unwritable while it searches. Through the
 * command table in this process with captured output; the search runs in real worker
 * threads on real temporary folders.
 *
 * The tests run as root, which may write where permissions forbid it, so "a folder no
 * one may write in" is made the way that binds root too: a path under a regular file
 * (ENOTDIR), or a name longer than the file system's limit (NAME_MAX, 255 bytes on
 * Linux; common practice).
 *
 * The problem is the five-point prescribed-timing four-bar problem of Cabrera, Simon and
 * Prado (2002, Mech. Mach. Theory 37:1165-1177), as in cli-fit.test.ts.
 */
import { existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main';
import { nodeIo } from '../../src/cli/nodeIo';
import { decodeCheckpoint } from '../../src/engine';

const TIMED5 = {
  format: 'loci-problem',
  version: 1,
  name: 'timed5',
  target: { points: [[3, 3], [2.759, 3.363], [2.372, 3.663], [1.89, 3.862], [1.355, 3.943]], closed: false },
  timing: { mode: 'prescribed', driverValues: [30, 45, 60, 75, 90], unit: 'deg' },
  placement: 'fixed',
  families: ['fourbar-lengths'],
  bounds: { 'fourbar-lengths': { r1: [0.5, 6], r2: [0.5, 6], r3: [0.5, 6], r4: [0.5, 6], rcx: [-5, 5], rcy: [-5, 5], x0: [-5, 5], y0: [-5, 5] } },
  constraints: { fullTurnCrank: true },
};

let dir = '';
let problem = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'loci-fit-faults-'));
  problem = join(dir, 'timed5.json');
  writeFileSync(problem, JSON.stringify(TIMED5));
});
afterAll(() => {
  rmSync(dir, { recursive: true, force: true });
});

interface Ran {
  code: number;
  stdout: string;
  stderr: string;
}

/** Runs `loci ...argv`; `onProgress` is called once, at the first progress line on stderr. */
async function loci(argv: string[], onProgress?: () => void): Promise<Ran> {
  let stdout = '';
  let stderr = '';
  let told = false;
  const code = await main(argv, {
    ...nodeIo,
    stdout: (t) => {
      stdout += t;
    },
    stderr: (t) => {
      stderr += t;
      if (!told && onProgress !== undefined && /evals\/s/.test(t)) {
        told = true;
        onProgress();
      }
    },
  });
  return { code, stdout, stderr };
}

function folder(name: string): string {
  const path = join(dir, name);
  mkdirSync(path, { recursive: true });
  return path;
}

type FitResult = { stopReason: string; evaluations: number; candidates: { rank: number; value: number }[] };

describe('paths loci fit cannot write: exit 2, with the reason, before any search', () => {
  const cases: readonly [string, () => string, RegExp][] = [
    ['a folder', () => folder('a-folder'), /a-folder is a folder; expected a file name/],
    ['in a folder that does not exist', () => join(dir, 'no-such-folder', 'x.json'), /the folder .*no-such-folder does not exist/],
    [
      'under a regular file (a folder no one can write in)',
      () => {
        writeFileSync(join(dir, 'plain-file'), '');
        return join(dir, 'plain-file', 'x.json');
      },
      /cannot use .*plain-file\/x\.json: a part of the path is a file, not a folder \(ENOTDIR\)/,
    ],
    ['a name over 255 bytes', () => join(dir, `${'n'.repeat(256)}.json`), /the name is too long for the file system \(ENAMETOOLONG\)/],
    // 250 bytes fit, but not the temporary files beside it (NAME.<pid>.tmp).
    ['a name whose temporary files would be over 255 bytes', () => join(dir, `${'t'.repeat(245)}.json`), /the name t+\.json is too long: the file system must also hold t+\.json\.(prev\.)?\d+\.tmp beside it/],
  ];
  for (const flag of ['--out', '--checkpoint']) {
    for (const [what, make, message] of cases) {
      it(`${flag} ${what}`, async () => {
        const path = make();
        const before = readdirSync(dir).sort();
        const r = await loci(['fit', problem, '--evals', '2000', '--workers', '1', flag, path]);
        expect(r.code).toBe(2);
        expect(r.stderr).toMatch(new RegExp(`^loci fit: ${flag}: .*${message.source}`));
        expect(r.stderr).not.toMatch(/evals\/s|unexpected failure|\n\s+at /);
        expect(r.stdout).toBe('');
        expect(readdirSync(dir).sort()).toEqual(before);
      });
    }
  }
});

describe('--checkpoint-every', () => {
  it('takes a number of seconds from 1 to 86400, with --checkpoint only', async () => {
    for (const bad of ['0', '-1', '0.5', 'abc', 'Infinity', 'NaN', '1e9', '']) {
      const r = await loci(['fit', problem, '--evals', '2000', '--checkpoint', join(dir, 'every.json'), '--checkpoint-every', bad]);
      expect(r.code, bad).toBe(2);
      expect(r.stderr, bad).toMatch(/^loci fit: --checkpoint-every: expected a number of seconds from 1 to 86400, got /);
    }
    const alone = await loci(['fit', problem, '--evals', '2000', '--checkpoint-every', '5']);
    expect(alone.code).toBe(2);
    expect(alone.stderr).toMatch(/--checkpoint-every needs --checkpoint FILE/);
    expect(existsSync(join(dir, 'every.json'))).toBe(false);
  });
});

describe('resuming from a damaged or missing checkpoint', () => {
  const args = (checkpoint: string) => ['fit', problem, '--evals', '4000', '--seed', '3', '--workers', '1', '--islands', '2', '--checkpoint', checkpoint, '--checkpoint-every', '1'];

  it('resumes from FILE.prev when FILE is damaged, says which file and why, and keeps the good FILE.prev', async () => {
    const checkpoint = join(folder('damaged'), 'ck.json');
    const first = await loci(args(checkpoint));
    expect(first.code).toBe(0);
    const good = readFileSync(`${checkpoint}.prev`, 'utf8');
    expect(decodeCheckpoint(good).ok).toBe(true);
    writeFileSync(checkpoint, readFileSync(checkpoint, 'utf8').slice(0, 500));

    const again = await loci(args(checkpoint));
    expect(again.code).toBe(0);
    expect(again.stderr).toMatch(/loci fit: skipped .*damaged\/ck\.json: checkpoint is not valid JSON/);
    expect(again.stderr).toMatch(/loci fit: resuming from .*damaged\/ck\.json\.prev \(.*damaged\/ck\.json was skipped\) at round \d+/);
    // Both files whole afterwards: the damaged one was replaced, never promoted over the good one.
    for (const file of [checkpoint, `${checkpoint}.prev`]) expect(decodeCheckpoint(readFileSync(file, 'utf8')).ok, file).toBe(true);
    expect(readdirSync(join(dir, 'damaged')).sort()).toEqual(['ck.json', 'ck.json.prev']);
  });

  it('resumes from FILE.prev when FILE is missing, and says so', async () => {
    const checkpoint = join(folder('missing'), 'ck.json');
    expect((await loci(args(checkpoint))).code).toBe(0);
    rmSync(checkpoint);
    const again = await loci(args(checkpoint));
    expect(again.code).toBe(0);
    expect(again.stderr).toMatch(/loci fit: .*missing\/ck\.json is missing/);
    expect(again.stderr).toMatch(/loci fit: resuming from .*missing\/ck\.json\.prev \(.*missing\/ck\.json is missing\) at round/);
  });

  it('refuses, with exit 2, a checkpoint file that holds no usable checkpoint', async () => {
    const checkpoint = join(folder('garbage'), 'ck.json');
    writeFileSync(checkpoint, 'not a checkpoint');
    const r = await loci(args(checkpoint));
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/ck\.json: no usable checkpoint: .*ck\.json: checkpoint is not valid JSON/);
  });
});

describe('signals and files that fail during the search', () => {
  // A time budget far longer than the test waits: each run is stopped by the test at its first progress line.
  const long = ['--seconds', '3600', '--workers', '2', '--islands', '2'];

  it('saves and writes the results so far on SIGTERM, as on Ctrl-C', async () => {
    const checkpoint = join(folder('sigterm'), 'ck.json');
    const out = join(dir, 'sigterm', 'out.json');
    const r = await loci(['fit', problem, ...long, '--checkpoint', checkpoint, '--out', out], () => {
      process.emit('SIGTERM', 'SIGTERM');
    });
    expect(r.code).toBe(0);
    expect(r.stderr).toMatch(/loci fit: SIGTERM; stopping after this round, saving to .*ck\.json and writing the results so far/);
    const result = JSON.parse(readFileSync(out, 'utf8')) as FitResult;
    expect(result.stopReason).toBe('interrupted');
    expect(result.candidates.length).toBeGreaterThan(0);
    // The checkpoint is the run as it stopped: the same evaluations as the results.
    const saved = decodeCheckpoint(readFileSync(checkpoint, 'utf8'));
    expect(saved.ok && saved.payload.evaluations).toBe(result.evaluations);
    expect(process.listenerCount('SIGTERM')).toBe(0);
  });

  it('prints the results on stdout, and exits 1, when --out can no longer be written at the end', async () => {
    const outFolder = folder('out-goes-away');
    const out = join(outFolder, 'out.json');
    const r = await loci(['fit', problem, ...long, '--out', out], () => {
      rmSync(outFolder, { recursive: true });
      writeFileSync(outFolder, '');
      process.emit('SIGINT', 'SIGINT');
    });
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/loci fit: cannot write the results to .*out\.json: a part of the path is a file, not a folder \(ENOTDIR\); they follow on standard output instead/);
    const result = JSON.parse(r.stdout) as FitResult;
    expect(result.stopReason).toBe('interrupted');
    expect(result.candidates[0].rank).toBe(1);
  });

  it('goes on when the checkpoint can no longer be saved, says so, and still writes its results', async () => {
    const ckFolder = folder('ck-goes-away');
    const checkpoint = join(ckFolder, 'ck.json');
    const out = join(dir, 'ck-goes-away-out.json');
    const r = await loci(['fit', problem, ...long, '--checkpoint', checkpoint, '--checkpoint-every', '1', '--out', out], () => {
      rmSync(ckFolder, { recursive: true });
      writeFileSync(ckFolder, '');
      process.emit('SIGTERM', 'SIGTERM');
    });
    expect(r.code).toBe(0);
    expect(r.stderr).toMatch(/loci fit: could not save the checkpoint to .*ck\.json: a part of the path is a file, not a folder \(ENOTDIR\); the search goes on, and its results will still be written/);
    expect(r.stderr).toMatch(/loci fit: .*ck\.json is older than these results: the last save failed/);
    expect(r.stderr).not.toMatch(/unexpected failure|\n\s+at /);
    const result = JSON.parse(readFileSync(out, 'utf8')) as FitResult;
    expect(result.candidates.length).toBeGreaterThan(0);
  });
});
