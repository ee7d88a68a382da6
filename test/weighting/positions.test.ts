/**
 * The weighting's projection of every target about the galaxy (solver/weighting.ts weightingPositions) reused by the
 * search's environment (solver/searchEnv.ts): the same bits as the environment's own projection, R/Re and azimuth,
 * and not reused for another target table or another galaxy placement.
 */
import { describe, expect, it } from 'vitest';
import { weighPlanTargets, targetWeights } from '../../src/core/pipeline/pipeline';
import { weightingPositions } from '../../src/core/solver/weighting';
import { searchEnv, targetAzimuthDeg } from '../../src/core/solver/searchEnv';
import { allocationContext } from '../../src/core/solver/allocateMasks';
import { catalogTargetColumns } from '../../src/core/catalog/validate';
import { TargetColumns } from '../../src/core/catalog/targetColumns';
import { galaxyModel } from '../../src/core/plan/validate';
import { scenario } from '../search/helpers';

describe('the weighting\'s target positions in the search environment', () => {
  const x = scenario({ seed: 77, candidates: 800, galaxy: { paDeg: 33, axisRatio: 0.55 } });
  const galaxy = galaxyModel(x.plan);
  const table = catalogTargetColumns(x.catalog);
  const weighting = weighPlanTargets(x.plan, table);
  const ctx = allocationContext(x.profile, galaxy, x.plan.goals.linesA, table, targetWeights(x.plan, table, [], weighting));
  const positions = weightingPositions(weighting)!;

  it('gives the same xi, eta, R/Re and azimuth as projecting every target again', () => {
    expect(positions).not.toBeNull();
    const own = searchEnv(x.plan, ctx);
    const reused = searchEnv(x.plan, ctx, positions);
    expect(reused.xi).toBe(positions.xiArcsec);
    expect(reused.xi).toEqual(own.xi);
    expect(reused.eta).toEqual(own.eta);
    expect(reused.radiusRe).toEqual(own.radiusRe);
    for (let i = 0; i < table.length; i++) expect(targetAzimuthDeg(reused, i)).toBe(targetAzimuthDeg(own, i));
    expect(own.radiusRe.some((r) => r > 1)).toBe(true);
  });

  it('is not used for another table or another galaxy placement', () => {
    const copy = TargetColumns.of(table.toTargets());
    const other = allocationContext(x.profile, galaxy, x.plan.goals.linesA, copy, ctx.weights);
    expect(searchEnv(x.plan, other, positions).xi).not.toBe(positions.xiArcsec);
    const turned = allocationContext(x.profile, { ...galaxy, paDeg: galaxy.paDeg + 10 }, x.plan.goals.linesA, table, ctx.weights);
    const env = searchEnv(x.plan, turned, positions);
    expect(env.xi).not.toBe(positions.xiArcsec);
    expect(env.radiusRe).not.toEqual(positions.radiusRe);
  });
});
