/**
 * The built-in demo: examples/demo/halo-demo.plan.json and the catalog it names, bundled as text.
 * When the example folder is missing (a partial checkout), the same invented scenario is generated
 * by the core scenario generator, so the editor still opens on a solved plan.
 */
import { generatedDemo } from './generatedDemo';
import type { LoadedFile } from '../session';

const files = import.meta.glob('/examples/demo/*', { query: '?raw', import: 'default', eager: true }) as Record<string, string>;

export interface DemoFiles {
  plan: LoadedFile;
  catalog: LoadedFile;
  /** True when the files come from examples/demo, false when generated here. */
  fromExamples: boolean;
}

/** The demo plan text and its catalog text. */
export function demoFiles(): DemoFiles {
  const planPath = Object.keys(files).find((p) => p.endsWith('.plan.json'));
  if (planPath) {
    const planText = files[planPath];
    let catalogName = '';
    try {
      catalogName = String((JSON.parse(planText) as { catalog?: unknown }).catalog ?? '');
    } catch { /* reported when the plan is parsed */ }
    const base = catalogName.split(/[\\/]/).pop() ?? '';
    const catPath = Object.keys(files).find((p) => p.endsWith(`/${base}`));
    if (catPath) {
      return { plan: { name: planPath.split('/').pop()!, content: planText }, catalog: { name: base, content: files[catPath] }, fromExamples: true };
    }
  }
  const g = generatedDemo();
  return { plan: { name: g.planName, content: g.planText }, catalog: { name: g.catalogName, content: g.catalogText }, fromExamples: false };
}
