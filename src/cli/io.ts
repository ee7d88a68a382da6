/** The streams a command writes to; injected so tests can capture them. */
export interface CliIO {
  out: (text: string) => void;
  err: (text: string) => void;
}

export const processIO: CliIO = {
  out: (t) => process.stdout.write(t.endsWith('\n') ? t : t + '\n'),
  err: (t) => process.stderr.write(t.endsWith('\n') ? t : t + '\n'),
};

export type Command = (argv: string[], io: CliIO) => Promise<number>;
