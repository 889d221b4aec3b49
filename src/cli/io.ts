/** Where a command writes: stdout for results, stderr for progress and problems. */
export interface CommandIo {
  readonly stdout: (text: string) => void;
  readonly stderr: (text: string) => void;
}

export const processIo: CommandIo = {
  stdout: (t) => process.stdout.write(t.endsWith('\n') ? t : `${t}\n`),
  stderr: (t) => process.stderr.write(t.endsWith('\n') ? t : `${t}\n`),
};

/** A progress line that rewrites itself on a terminal and prints every tenth step otherwise. */
export function progressPrinter(io: CommandIo, isTty = Boolean(process.stderr.isTTY)): (label: string, done: number, total: number) => void {
  let lastTenth = -1;
  return (label, done, total) => {
    const pct = total === 0 ? 100 : Math.floor((100 * done) / total);
    if (isTty) {
      process.stderr.write(`\r${label}: ${done}/${total} (${pct}%)${done === total ? '\n' : ''}`);
      return;
    }
    const tenth = Math.floor(pct / 10);
    if (tenth !== lastTenth || done === total) {
      lastTenth = tenth;
      io.stderr(`${label}: ${done}/${total} (${pct}%)`);
    }
  };
}
