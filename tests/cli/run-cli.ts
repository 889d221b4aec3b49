import { spawn } from 'node:child_process';
import { resolve } from 'node:path';

export interface CliResult {
  readonly code: number;
  readonly stdout: string;
  readonly stderr: string;
}

/** Runs `tessera VERB ...` as a child process, the way `npm run tessera --` does. */
export function runCli(args: readonly string[], { env = {} as Record<string, string> } = {}): Promise<CliResult> {
  return new Promise((done, fail) => {
    const child = spawn(process.execPath, ['--import', 'tsx', resolve('src/cli/main.ts'), ...args], {
      cwd: resolve('.'),
      env: { ...process.env, ...env },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (d: Buffer) => (stdout += d.toString()));
    child.stderr.on('data', (d: Buffer) => (stderr += d.toString()));
    child.on('error', fail);
    child.on('close', (code) => done({ code: code ?? -1, stdout, stderr }));
  });
}
