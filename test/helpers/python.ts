import { execFileSync } from 'node:child_process';

/**
 * Run a Python 3 script (numpy/scipy available) with JSON on stdin and parse
 * the JSON it prints. Used for cross-checks against reference libraries.
 * The script reads `data = json.load(sys.stdin)` and ends with `print(json.dumps(result))`.
 */
export function runPython<T>(script: string, input: unknown): T {
  const output = execFileSync('python3', ['-c', script], {
    input: JSON.stringify(input),
    encoding: 'utf8',
    maxBuffer: 256 * 1024 * 1024,
  });
  return JSON.parse(output) as T;
}
