/** The command line run in this process through its command table, with its output captured. */
import { main } from '../../src/cli/main';
import { nodeIo } from '../../src/cli/nodeIo';

export async function loci(...argv: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  let stdout = '';
  let stderr = '';
  const code = await main(argv, { ...nodeIo, stdout: (t) => { stdout += t; }, stderr: (t) => { stderr += t; } });
  return { code, stdout, stderr };
}
