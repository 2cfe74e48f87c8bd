/**
 * The leg workspace's set-up: values typed into its fields read into exactly the problem
 * the problem file's reader makes of the same values; every bad value is said at its
 * field and nothing is clamped; the project keeps the set-up, and a project kept before
 * the leg workspace still reads.
 */
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseSynthesisProblemFile } from '../../../src/core/io/problem';
import { createDemoProject } from '../../../src/app/demo/demoProject';
import { demoLegSetup, legInputOfFile, setupOfInput } from '../../../src/app/leg/demo';
import { fieldKeyOf, issueLine, issuesByField } from '../../../src/app/leg/issues';
import { readLegSetup } from '../../../src/app/leg/readSetup';
import { emptyLegSetup, reduceLegSetup, type LegSetup, type LegSetupAction } from '../../../src/app/leg/setup';
import { storedLegOf } from '../../../src/app/leg/stored';
import { readProject } from '../../../src/app/storage/projectSchema';

const EXAMPLE = resolve(import.meta.dirname, '../../../public/examples/toy-walker-leg-problem.json');
const fileJson = JSON.parse(readFileSync(EXAMPLE, 'utf8')) as unknown;

function typed(actions: readonly LegSetupAction[], from: LegSetup = emptyLegSetup()): LegSetup {
  return actions.reduce(reduceLegSetup, from);
}

/** The toy walker's problem file, typed field by field as a user would (values copied from public/examples/toy-walker-leg-problem.json). */
const TYPED_TOY_WALKER: LegSetupAction[] = [
  { type: 'name', text: 'Toy walker leg' },
  { type: 'family', family: 'watt-i', on: true },
  { type: 'family', family: 'stephenson-i', on: true },
  { type: 'groundText', field: 'yMm', text: '-30' },
  { type: 'stanceTolerance', text: '0.8' },
  { type: 'crankDirection', sense: -1 },
  { type: 'steps', text: '180' },
  { type: 'targetOn', key: 'strideMm', on: true },
  { type: 'targetText', key: 'strideMm', field: 'value', text: '24' },
  { type: 'targetText', key: 'strideMm', field: 'weight', text: '1' },
  { type: 'targetText', key: 'strideMm', field: 'tolerance', text: '1' },
  { type: 'targetOn', key: 'stepHeightMm', on: true },
  { type: 'targetText', key: 'stepHeightMm', field: 'value', text: '8' },
  { type: 'targetText', key: 'stepHeightMm', field: 'weight', text: '1' },
  { type: 'targetText', key: 'stepHeightMm', field: 'tolerance', text: '1' },
  { type: 'targetOn', key: 'minDutyFactor', on: true },
  { type: 'targetText', key: 'minDutyFactor', field: 'value', text: '0.45' },
  { type: 'targetText', key: 'minDutyFactor', field: 'weight', text: '1' },
  { type: 'targetText', key: 'minDutyFactor', field: 'tolerance', text: '0.05' },
  { type: 'targetOn', key: 'maxFlatnessMm', on: true },
  { type: 'targetText', key: 'maxFlatnessMm', field: 'value', text: '1.2' },
  { type: 'targetText', key: 'maxFlatnessMm', field: 'weight', text: '0.5' },
  { type: 'targetText', key: 'maxFlatnessMm', field: 'tolerance', text: '0.5' },
  { type: 'targetOn', key: 'maxSpeedVariation', on: true },
  { type: 'targetText', key: 'maxSpeedVariation', field: 'value', text: '0.5' },
  { type: 'targetText', key: 'maxSpeedVariation', field: 'weight', text: '0.5' },
  { type: 'targetText', key: 'maxSpeedVariation', field: 'tolerance', text: '0.1' },
  { type: 'targetOn', key: 'minTransmissionDegInStance', on: true },
  { type: 'targetText', key: 'minTransmissionDegInStance', field: 'value', text: '35' },
  { type: 'targetText', key: 'minTransmissionDegInStance', field: 'weight', text: '1' },
  { type: 'targetText', key: 'minTransmissionDegInStance', field: 'tolerance', text: '5' },
  { type: 'targetOn', key: 'sizeBoxMm', on: true },
  { type: 'targetText', key: 'sizeBoxMm', field: 'value', text: '60' },
  { type: 'targetText', key: 'sizeBoxMm', field: 'value2', text: '55' },
  { type: 'targetText', key: 'sizeBoxMm', field: 'weight', text: '1' },
  { type: 'targetText', key: 'sizeBoxMm', field: 'tolerance', text: '2' },
  { type: 'keepOutAdd' },
  { type: 'keepOutText', index: 0, field: 'name', text: 'battery box' },
  { type: 'keepOutText', index: 0, field: 'x', text: '-20' },
  { type: 'keepOutText', index: 0, field: 'y', text: '8' },
  { type: 'keepOutText', index: 0, field: 'r', text: '7' },
  { type: 'regionAdd', family: 'fourbar', variable: 'A0.x' },
  { type: 'regionText', family: 'fourbar', index: 0, field: 'min', text: '-1' },
  { type: 'regionText', family: 'fourbar', index: 0, field: 'max', text: '1' },
  { type: 'regionAdd', family: 'fourbar', variable: 'A0.y' },
  { type: 'regionText', family: 'fourbar', index: 1, field: 'min', text: '-1' },
  { type: 'regionText', family: 'fourbar', index: 1, field: 'max', text: '1' },
  { type: 'regionAdd', family: 'fourbar', variable: 'A.x' },
  { type: 'regionText', family: 'fourbar', index: 2, field: 'min', text: '-12' },
  { type: 'regionText', family: 'fourbar', index: 2, field: 'max', text: '12' },
  { type: 'regionAdd', family: 'fourbar', variable: 'A.y' },
  { type: 'regionText', family: 'fourbar', index: 3, field: 'min', text: '-12' },
  { type: 'regionText', family: 'fourbar', index: 3, field: 'max', text: '12' },
  { type: 'budget', field: 'evaluations', text: '3000' },
];

describe('leg set-up → problem', () => {
  it('typing the toy walker problem file\'s values gives exactly the problem its file reader makes', () => {
    // Second, independent method: the problem file reader (schema, then createLegProblem) on the file itself.
    const fromFile = parseSynthesisProblemFile(fileJson);
    expect(fromFile.ok).toBe(true);
    const reading = readLegSetup(typed(TYPED_TOY_WALKER));
    if (!reading.ok) throw new Error(JSON.stringify(reading.issues));
    if (!fromFile.ok) return;
    expect(reading.problem).toEqual(fromFile.problem);
    expect(reading.settings).toEqual({ seed: 1, budget: { evaluations: 3000, seconds: null } });
  });

  it('the demo opens on the toy walker problem file\'s content', () => {
    const fromFile = parseSynthesisProblemFile(fileJson);
    const reading = readLegSetup(demoLegSetup());
    if (!reading.ok) throw new Error(JSON.stringify(reading.issues));
    expect(fromFile.ok && reading.problem).toEqual(fromFile.ok && fromFile.problem);
    expect(reading.phasing).toEqual({ legs: 3, phasesDeg: [0, 120, 240] });
  });

  it('a problem with a foot trajectory, a sloping ground line and six-bar regions reads back through the fields unchanged', () => {
    // An own problem file: a 40 mm stride on a line sloping up 1 in 20, a trajectory of five points, a Watt I region.
    const file = {
      format: 'loci-problem', version: 1, kind: 'leg', name: 'Slope walker',
      families: ['watt-i', 'slider-crank'],
      ground: { kind: 'line', point: { x: 0, y: -50 }, direction: { x: 20, y: 1 } },
      stanceToleranceMm: 1.5, crankDirection: 1, walkingDirection: -1, steps: 240,
      targets: {
        footPath: { points: [[-20, -51], [0, -50], [20, -49], [10, -35], [-10, -36]], weight: 2, toleranceMm: 0.5 },
        minDutyFactor: { min: 0.5 },
        minTransmissionDegInStance: { min: 30, toleranceDeg: 3 },
      },
      keepOut: [{ x: 30, y: 10, r: 5 }],
      bounds: { 'watt-i': { 'A0.x': [-5, 5], 'A0.y': [-5, 5] } },
    };
    const fromFile = parseSynthesisProblemFile(file);
    if (!fromFile.ok) throw new Error(JSON.stringify(fromFile.issues));
    const input = legInputOfFile(file);
    if (input === null) throw new Error('not read as a leg problem');
    const reading = readLegSetup(setupOfInput(input, { evaluations: 100, seconds: 5 }, 3));
    if (!reading.ok) throw new Error(JSON.stringify(reading.issues));
    expect(reading.problem).toEqual(fromFile.problem);
    expect(reading.settings).toEqual({ seed: 3, budget: { evaluations: 100, seconds: 5 } });
  });

  it('says every bad value at its field, with the unit expected, and clamps nothing', () => {
    const setup = typed([
      { type: 'stanceTolerance', text: '-0.5' },
      { type: 'groundText', field: 'yMm', text: '12,5' },
      { type: 'pointAdd', x: '0', y: '0' },
      { type: 'pointAdd', x: '10', y: '' },
      { type: 'pointAdd', x: '20', y: '5' },
      { type: 'targetOn', key: 'minDutyFactor', on: true },
      { type: 'targetText', key: 'minDutyFactor', field: 'value', text: '1.5' },
      { type: 'targetOn', key: 'stepHeightMm', on: true },
      { type: 'targetText', key: 'stepHeightMm', field: 'value', text: '6' },
      { type: 'targetText', key: 'stepHeightMm', field: 'weight', text: '-2' },
      { type: 'family', family: 'fourbar', on: false },
      { type: 'seed', text: '1.5' },
      { type: 'phasing', field: 'legs', text: '2' },
      { type: 'keepOutAdd' },
      { type: 'keepOutText', index: 0, field: 'x', text: '3' },
      { type: 'keepOutText', index: 0, field: 'y', text: '3' },
      { type: 'keepOutText', index: 0, field: 'r', text: '0' },
    ]);
    const reading = readLegSetup(setup);
    expect(reading.ok).toBe(false);
    if (reading.ok) return;
    const byField = issuesByField(reading.issues);
    expect(byField.get('stanceToleranceMm')?.join()).toMatch(/-0\.5.*greater than 0/);
    expect(byField.get('ground.yMm')?.join()).toMatch(/"12,5" is not a number/);
    expect(byField.get('targets.footPath.points[1]')?.join()).toMatch(/empty; expected y of point 2 in mm/);
    expect(byField.get('targets.minDutyFactor.min')?.join()).toMatch(/1\.5.*from 0 to 1/);
    expect(byField.get('targets.stepHeightMm.weight')?.join()).toMatch(/-2/);
    expect(byField.get('families')?.join()).toMatch(/empty/);
    expect(byField.get('budget.evaluations')?.join()).toMatch(/empty/);
    expect(byField.get('seed')?.join()).toMatch(/1\.5.*whole number/);
    expect(byField.get('phasing.phasesDeg')?.join()).toMatch(/1 phase; expected one per leg \(2\)/);
    expect(byField.get('keepOut[0]')?.join()).toMatch(/r > 0/);
    // The texts are kept as typed.
    expect(setup.stanceToleranceMm).toBe('-0.5');
    expect(setup.targets.minDutyFactor.value).toBe('1.5');
  });

  it('puts each issue of a row on its row and each list issue beside its list', () => {
    expect(fieldKeyOf('targets.footPath.points[3].x')).toBe('targets.footPath.points[3]');
    expect(fieldKeyOf('targets.footPath')).toBe('targets.footPath.points');
    expect(fieldKeyOf('keepOut[2].r')).toBe('keepOut[2]');
    expect(fieldKeyOf('families[1]')).toBe('families');
    expect(fieldKeyOf('bounds.fourbar.A0.x')).toBe('bounds.fourbar.A0.x');
  });
});

describe('the project keeps the leg workspace', () => {
  it('reads a project with the leg set-up back as it was kept, and one kept before the leg workspace without it', () => {
    const older = readProject(JSON.parse(JSON.stringify(createDemoProject())));
    expect(older.ok && older.project.leg).toBeUndefined();
    const leg = storedLegOf({ setup: typed([{ type: 'pointAdd', x: '1', y: '' }]) });
    const kept = readProject(JSON.parse(JSON.stringify({ ...createDemoProject(), leg })));
    if (!kept.ok) throw new Error(kept.reason);
    expect(kept.project.leg).toEqual(leg);
    const damaged = readProject(JSON.parse(JSON.stringify({ ...createDemoProject(), leg: { setup: { ...leg.setup, crankDirection: 2 } } })));
    expect(damaged.ok).toBe(false);
  });
});

describe('issues in the page\'s words', () => {
  it('names each field as the page labels it', () => {
    expect(issueLine({ path: 'targets.stepHeightMm.weight', message: 'is -2' })).toBe('Step height: weight: is -2');
    expect(issueLine({ path: 'targets.sizeBoxMm.heightMm', message: 'm' })).toBe('Size box: Height at most: m');
    expect(issueLine({ path: 'targets.footPath.points[2].x', message: 'm' })).toBe('Foot trajectory point 3: m');
    expect(issueLine({ path: 'bounds.watt-i.A0.x', message: 'm' })).toBe('Watt I six-bar region A0.x: m');
    expect(issueLine({ path: 'keepOut[0]', message: 'm' })).toBe('Keep-out circle 1: m');
    expect(issueLine({ path: 'seed', message: 'm' })).toBe('Seed: m');
  });
});
