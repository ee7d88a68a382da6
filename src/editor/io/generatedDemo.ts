/** The invented demo scenario generated in place, used when examples/demo is not in the checkout (same seed, same rows). */
import { generateScenario } from '../../core/scenario/generator';

export interface DemoText {
  planName: string;
  planText: string;
  catalogName: string;
  catalogText: string;
}

/** Plan and catalog text of the generated demo (3 000 candidates, seed 1). */
export function generatedDemo(): DemoText {
  const s = generateScenario({ seed: 1, candidates: 3000 });
  return {
    planName: 'halo-demo.plan.json',
    planText: JSON.stringify(s.plan, null, 2) + '\n',
    catalogName: String((s.plan as { catalog?: string }).catalog ?? 'halo-demo.catalog.csv'),
    catalogText: s.catalogCsv,
  };
}
