import { execFileSync } from 'node:child_process';

/**
 * Run a Python 3 script (numpy/scipy available) with JSON on stdin and parse
 * the JSON it prints. Used for cross-checks against reference libraries.
 * The script reads `data = json.load(sys.stdin)` and ends with `print(json.dumps(result))`.
 * numpy's BLAS/OpenMP pools are limited to one thread: several test workers share
 * two cores, and contending pools make small linear algebra tens of times slower.
 * SPEEDBAND_PYTHON names another interpreter (CI sets it when python3 lacks scipy).
 */
export function runPython<T>(script: string, input: unknown): T {
  const output = execFileSync(process.env.SPEEDBAND_PYTHON ?? 'python3', ['-c', script], {
    input: JSON.stringify(input),
    encoding: 'utf8',
    maxBuffer: 256 * 1024 * 1024,
    env: { ...process.env, OPENBLAS_NUM_THREADS: '1', OMP_NUM_THREADS: '1', MKL_NUM_THREADS: '1' },
  });
  return JSON.parse(output) as T;
}
