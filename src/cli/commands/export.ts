/** `haloweave export` (not built yet). */
import type { CliIO } from '../io';

export async function run(_argv: string[], io: CliIO): Promise<number> {
  io.err('haloweave export: not built yet');
  return 2;
}
