/**
 * The plan's `search` section: the pointing search's seed and effort, and the coefficients of its objective
 * (solver/objective.ts, solver/pointingSearch.ts; docs/search.md).
 */
import { z } from 'zod';

/** Coefficients of the coverage terms (plan `search.objective`). */
export const objectiveWeightsSchema = z.looseObject({
  aBin: z.number().min(0).optional(),
  kBin: z.number().int().positive().optional(),
  aSector: z.number().min(0).optional(),
  kSector: z.number().int().positive().optional(),
  aStarlightBin: z.number().min(0).optional(),
  aStarlightReach: z.number().min(0).optional(),
  aStarlightSector: z.number().min(0).optional(),
  /** Weight of the light free masks lose to refraction across their slits (fraction of each mask's tracer weight); 0 turns the term off. */
  aRefraction: z.number().min(0).optional(),
});

/** The plan's `search` section. */
export const searchSchema = z.looseObject({
  /** Seed of the search's random trial moves (same seed, same result). */
  seed: z.union([z.number(), z.string()]).optional(),
  /** Number of step-size levels (each halves the step; default 4) and passes over the masks per level (default 2; a pass that improves nothing ends the level). */
  levels: z.number().int().min(0).max(12).optional(),
  passes: z.number().int().min(1).max(10).optional(),
  /** Random trial moves per mask and pass, besides the 6 axis moves (default 1). */
  randomTrials: z.number().int().min(0).max(50).optional(),
  /** Effort of the search (default 1): scales step levels, random trials, kicks and starts searched; 10 is about ten times longer. */
  effort: z.number().min(0.1).max(100).optional(),
  /** Jumps of one mask to a random place followed by a local search, kept only when the layout ends better (default effort x free masks). */
  kicks: z.number().int().min(0).max(1000).optional(),
  /** Starting layouts searched, best first (default 1, 3 from effort 4). */
  starts: z.number().int().min(1).max(8).optional(),
  /** false: keep the naive cross layout for unplaced masks (no search). */
  enabled: z.boolean().optional(),
  objective: objectiveWeightsSchema.optional(),
});
export type SearchRules = z.infer<typeof searchSchema>;
