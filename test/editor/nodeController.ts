/** An editor controller for tests in Node: its solvers only count requests (no worker), autosave never fires in a test. */
import { EditorController } from '../../src/editor/controller';
import type { SolverClient } from '../../src/editor/worker/solverClient';

export function nodeController(confirm: (q: string) => boolean = () => true): EditorController {
  let id = 0;
  const fake = { setInputs() {}, request: () => ++id, cancel() {}, dispose() {} } as unknown as SolverClient;
  return new EditorController({ confirm, makeSolver: () => fake, autosaveDelayMs: 1e9 });
}
