/** Where the CLI writes; tests pass their own to run commands in-process. */
export interface CliIo {
  out(text: string): void;
  err(text: string): void;
  /** True when stdout is a terminal (live progress display allowed). */
  isTty: boolean;
  /** Colour allowed (terminal and NO_COLOR unset). */
  color: boolean;
}

export function processIo(): CliIo {
  const isTty = Boolean(process.stdout.isTTY);
  return {
    out: (t) => void process.stdout.write(t),
    err: (t) => void process.stderr.write(t),
    isTty,
    color: isTty && process.env['NO_COLOR'] === undefined,
  };
}

/** An in-memory CliIo for tests: what was written is in `stdout` / `stderr`. */
export function memoryIo(): CliIo & { stdout: string; stderr: string } {
  const io = {
    stdout: '',
    stderr: '',
    isTty: false,
    color: false,
    out(t: string) {
      io.stdout += t;
    },
    err(t: string) {
      io.stderr += t;
    },
  };
  return io;
}
