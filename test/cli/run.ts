/** The CLI run in-process with its output captured: the exit code, stdout and stderr of `gainwright ARGS`. */
import { main } from '../../src/cli/cli.js';

export async function run(args: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '', err = '';
  const code = await main(args, { out: (s) => { out += s; }, err: (s) => { err += s; } });
  return { code, out, err };
}
