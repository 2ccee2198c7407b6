/** Runs the command line in-process with captured standard output and error. */
import { main } from '../../app/cli/main.ts';

class Sink {
  text = '';
  write(chunk: string) {
    this.text += chunk;
    return true;
  }
}

export async function runCli(...argv: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  const stdout = new Sink();
  const stderr = new Sink();
  const code = await main(argv, { stdout: stdout as never, stderr: stderr as never });
  return { code, stdout: stdout.text, stderr: stderr.text };
}
