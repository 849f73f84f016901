// The `veer` command run in this process, as the command-line tests run it:
// its exit status and what it printed to stdout and stderr.
import { runCli } from '../../src/cli/main';

export function runVeer(args: string[]): { status: number; out: string; err: string } {
  let out = '';
  let err = '';
  const status = runCli(args, { out: (s) => { out += s; }, err: (s) => { err += s; }, isTTY: false });
  return { status, out, err };
}
