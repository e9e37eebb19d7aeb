import { runPython } from '../helpers/python.js';

/**
 * runPython with numpy's BLAS/OpenMP pools limited to one thread. On a shared
 * machine with several test processes, the default thread pools contend and small
 * linear algebra (e.g. 8,000 batched 7×7 matrix exponentials) runs ~40× slower.
 */
export function runPythonSingleThread<T>(script: string, input: unknown): T {
  const prefix = 'import os\nfor _v in ("OPENBLAS_NUM_THREADS", "OMP_NUM_THREADS", "MKL_NUM_THREADS"):\n    os.environ.setdefault(_v, "1")\n';
  return runPython<T>(prefix + script, input);
}
