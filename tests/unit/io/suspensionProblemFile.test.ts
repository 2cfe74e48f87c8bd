/**
 * The problem file of kind "suspension": the example reads, a file without "kind" is a
 * path problem as before, and every bad bound, name, weight or cog is refused with the
 * field it concerns and what was expected.
 */
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseProblemFile, parseSynthesisProblemFile } from '../../../src/core/io/problem';
import { createObjective, isSuspensionProblem } from '../../../src/core/synthesis';
import { createSuspensionResponse } from '../../../src/core/synthesis/objective/suspensionResponse';
import { layoutVariableNames } from '../../../src/core/synthesis/suspensionProblem';

const root = resolve(import.meta.dirname, '../../..');
const example = (): Record<string, unknown> => JSON.parse(readFileSync(resolve(root, 'public/examples/trail-bike-suspension-problem.json'), 'utf8'));
const timed5 = (): Record<string, unknown> => JSON.parse(readFileSync(resolve(root, 'tests/reference/problems/timed5.json'), 'utf8'));

function issuesOf(json: unknown): string[] {
  const read = parseSynthesisProblemFile(json);
  return read.ok ? [] : read.issues.map((i) => `${i.path}: ${i.message}`);
}

describe('problem file of kind "suspension"', () => {
  it('reads the example, and each of its layouts builds an objective that evaluates', () => {
    const read = parseSynthesisProblemFile(example());
    expect(read.ok).toBe(true);
    if (!read.ok || !isSuspensionProblem(read.problem)) throw new Error('not a suspension problem');
    expect(read.problem.layouts).toEqual(['singlePivot', 'fourBarSeatStayAxle', 'wattSixBar']);
    for (const layout of read.problem.layouts) {
      const objective = createObjective(read.problem, layout);
      const x = new Float64Array(objective.dim);
      for (let j = 0; j < objective.dim; j++) x[j] = 0.5 * (objective.lower[j] + objective.upper[j]);
      const out = new Float64Array(2);
      objective.evaluate(x, out);
      expect(Number.isFinite(out[0])).toBe(true);
      expect(out[1]).toBeGreaterThanOrEqual(0);
    }
  });

  it('a file without "kind" is a path problem, and "kind": "path" reads the same', () => {
    const plain = parseSynthesisProblemFile(timed5());
    const marked = parseSynthesisProblemFile({ ...timed5(), kind: 'path' });
    expect(plain.ok && plain.problem.kind).toBe('path');
    expect(marked).toEqual(plain);
    // The path-only reader refuses a suspension problem, naming the field.
    const refused = parseProblemFile(example());
    expect(refused.ok).toBe(false);
    if (!refused.ok) expect(refused.issues[0].path).toBe('kind');
  });

  it('refuses, field by field, what an objective could not use', () => {
    const bad = example();
    bad.bounds = {
      singlePivot: { 'mainPivot.x': [40, 20], 'mainPivot.z': [0, 1], shockAngle: [0, 0] },
      shortLinkFourBar: { 'lowerPivot.x': [0, 10] },
    };
    (bad.targets as Record<string, Record<string, unknown>>).antiSquatAtSag.cogs = [21, 23];
    (bad.targets as Record<string, Record<string, unknown>>).leverageRatio.weight = -1;
    (bad.targets as Record<string, Record<string, unknown>>).travelMm.min = 160;
    const issues = issuesOf(bad);
    const expectIssue = (path: string, words: string) => expect(issues.some((i) => i.startsWith(`${path}: `) && i.includes(words)), `${path} … ${words} in ${issues.join(' | ')}`).toBe(true);
    expectIssue('bounds.singlePivot.mainPivot.x', 'lower < upper');
    expectIssue('bounds.singlePivot.mainPivot.z', 'no such variable');
    expectIssue('bounds.singlePivot.shockAngle', 'lower < upper');
    expectIssue('bounds.shortLinkFourBar', "not one of the problem's layouts");
    expectIssue('targets.antiSquatAtSag.cogs[1]', 'not a cog of the bicycle');
    expectIssue('targets.leverageRatio.weight', 'expected a weight');
    expectIssue('targets.travelMm', 'expected min ≤ max');
  });

  it('refuses unknown fields and unknown layouts by the schema, and a bad bicycle in its own words', () => {
    const extra = { ...example(), layout: 'singlePivot' };
    expect(issuesOf(extra).some((i) => i.includes('unknown field'))).toBe(true);
    const unknownLayout = { ...example(), layouts: ['singlePivot', 'eightBar'] };
    expect(issuesOf(unknownLayout).some((i) => i.startsWith('layouts[1]'))).toBe(true);
    const bike = example();
    (bike.bicycle as Record<string, unknown>).sag = 30;
    expect(issuesOf(bike).some((i) => i.startsWith('bicycle.sag') && i.includes('percentage'))).toBe(true);
  });
});

describe('problem file of kind "suspension": a six-bar\'s bodies', () => {
  it('reads the axle body and the shock bodies of a six-bar; a layout without them keeps the defaults', () => {
    const json = example();
    json.layoutBodies = { wattSixBar: { axleBody: 'chainStay', shock: { eye: 'bellCrank', frameEye: 'rocker' } } };
    const read = parseSynthesisProblemFile(json);
    if (!read.ok || !isSuspensionProblem(read.problem)) throw new Error(`not read: ${read.ok ? 'kind' : read.issues.map((i) => i.message).join('; ')}`);
    expect(read.problem.layoutBodies.wattSixBar).toEqual({ axleBody: 'chainStay', shock: { eye: 'bellCrank', frameEye: 'rocker' } });
    expect(read.problem.layoutBodies.singlePivot).toBeUndefined();
    // The response builds the layout with them: the shock's other eye is a joint of the rocker, the axle on the chain stay.
    const response = createSuspensionResponse(read.problem, 'wattSixBar', layoutVariableNames('wattSixBar'));
    const linkage = response.plan.linkage;
    expect(linkage.joints.find((j) => j.id === 'shockFrameEye')?.ground).toBeUndefined();
    expect(linkage.bodies.find((b) => b.id === 'rocker')?.joints).toContain('shockFrameEye');
    expect(linkage.points?.find((p) => p.id === 'axle')?.body).toBe('chainStay');
    const objective = createObjective(read.problem, 'wattSixBar');
    const x = new Float64Array(objective.dim);
    for (let j = 0; j < objective.dim; j++) x[j] = 0.5 * (objective.lower[j] + objective.upper[j]);
    const out = new Float64Array(2);
    objective.evaluate(x, out);
    expect(Number.isFinite(out[0])).toBe(true);

    const plain = parseSynthesisProblemFile(example());
    if (!plain.ok || !isSuspensionProblem(plain.problem)) throw new Error('example not read');
    expect(plain.problem.layoutBodies.wattSixBar).toEqual({ axleBody: 'seatStay', shock: { eye: 'bellCrank', frameEye: 'frontFrame' } });
  });

  it('refuses bodies for a kind without a choice, for a layout not listed, and a shock with both eyes on one body', () => {
    const json = example();
    json.layoutBodies = {
      singlePivot: { axleBody: 'seatStay' },
      stephensonSixBar: { axleBody: 'rocker' },
      wattSixBar: { shock: { eye: 'link', frameEye: 'link' } },
    };
    const issues = issuesOf(json);
    expect(issues.some((i) => i.startsWith('layoutBodies.singlePivot: ') && i.includes('expected a six-bar')), issues.join(' | ')).toBe(true);
    expect(issues.some((i) => i.startsWith('layoutBodies.stephensonSixBar: ') && i.includes('not one of the problem\'s layouts')), issues.join(' | ')).toBe(true);
    expect(issues.some((i) => i.startsWith('layoutBodies.wattSixBar.shock: ') && i.includes('both on the link')), issues.join(' | ')).toBe(true);
    const badName = example();
    badName.layoutBodies = { wattSixBar: { axleBody: 'swingArm' } };
    expect(issuesOf(badName).some((i) => i.startsWith('layoutBodies.wattSixBar.axleBody: ') && i.includes('"bellCrank"'))).toBe(true);
  });
});
