import { execFileSync, spawn, type ChildProcess } from 'node:child_process';
import { closeSync, mkdtempSync, openSync, readSync, rmSync, writeSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

/**
 * Run a Python 3 script (numpy/scipy available) with JSON on stdin and parse
 * the JSON it prints. Used for cross-checks against reference libraries.
 * The script reads `data = json.load(sys.stdin)` and ends with `print(json.dumps(result))`.
 * numpy's BLAS/OpenMP pools are limited to one thread: several test workers share
 * two cores, and contending pools make small linear algebra tens of times slower.
 * SPEEDBAND_PYTHON names another interpreter (CI sets it when python3 lacks scipy).
 *
 * The scripts run in one long-lived interpreter per test process (numpy and scipy imported once,
 * ≈ 1 s saved per call), each in a fresh namespace with its input as stdin and its printed output
 * captured; requests and answers cross two named pipes, read synchronously. Where named pipes are
 * not available the script runs in a new interpreter as before.
 */
export function runPython<T>(script: string, input: unknown): T {
  const server = pythonServer();
  const text = JSON.stringify(input);
  if (server === null) return JSON.parse(runInNewInterpreter(script, text)) as T;
  const answer = server.request(script, text);
  if (answer.error !== undefined) throw new Error(`python script failed:\n${answer.error}`);
  return JSON.parse(answer.output) as T;
}

const PYTHON = process.env.SPEEDBAND_PYTHON ?? 'python3';
const SINGLE_THREAD = { OPENBLAS_NUM_THREADS: '1', OMP_NUM_THREADS: '1', MKL_NUM_THREADS: '1' };
/**
 * glibc's allocator kept from returning memory to the system at every free: numpy's temporaries of a dense
 * frequency sweep (0.5 MB each) otherwise map and unmap pages at each operation, and a script's time varies
 * fourfold with what ran before it in the interpreter (7.6 s against 1.7 s for the sampled-margins reference,
 * most of it in the kernel). Only how memory is obtained changes, never a computed value.
 */
const ALLOCATOR = { MALLOC_MMAP_THRESHOLD_: String(32 << 20), MALLOC_TRIM_THRESHOLD_: String(128 << 20), MALLOC_TOP_PAD_: String(64 << 20) };
const INTERPRETER_ENV = { ...process.env, ...SINGLE_THREAD, ...ALLOCATOR };

function runInNewInterpreter(script: string, input: string): string {
  return execFileSync(PYTHON, ['-c', script], { input, encoding: 'utf8', maxBuffer: 256 * 1024 * 1024, env: INTERPRETER_ENV });
}

/** The interpreter's loop: read a framed request, run it, answer with its output or its traceback. */
const SERVER = String.raw`
import contextlib, io, json, sys, traceback
import numpy, scipy, scipy.signal, scipy.linalg, scipy.optimize, scipy.stats
requests = open(sys.argv[1], 'rb')
answers = open(sys.argv[2], 'wb')
def read_frame():
    size = int(requests.readline())
    return requests.read(size).decode('utf8')
while True:
    try:
        request = json.loads(read_frame())
    except ValueError:
        break
    stdout = io.StringIO()
    try:
        sys.stdin = io.StringIO(request['input'])
        with contextlib.redirect_stdout(stdout):
            exec(compile(request['script'], '<test script>', 'exec'), {'__name__': '__main__'})
        reply = {'output': stdout.getvalue()}
    except BaseException:
        reply = {'error': traceback.format_exc()}
    data = json.dumps(reply).encode('utf8')
    answers.write(str(len(data)).encode('ascii') + b'\n' + data)
    answers.flush()
`;

interface Server {
  request(script: string, input: string): { output: string; error?: string };
}

let server: Server | null | undefined;

function pythonServer(): Server | null {
  if (server !== undefined) return server;
  try {
    server = startServer();
  } catch {
    server = null;
  }
  return server;
}

function startServer(): Server {
  const folder = mkdtempSync(join(tmpdir(), 'speedband-python-'));
  const requestsPath = join(folder, 'requests');
  const answersPath = join(folder, 'answers');
  execFileSync('mkfifo', [requestsPath, answersPath]);
  const child: ChildProcess = spawn(PYTHON, ['-c', SERVER, requestsPath, answersPath], {
    stdio: ['ignore', 'inherit', 'inherit'],
    env: INTERPRETER_ENV,
  });
  child.unref();
  // Opening a pipe blocks until the other end opens it: requests first, as the interpreter does.
  const requests = openSync(requestsPath, 'w');
  const answers = openSync(answersPath, 'r');
  process.once('exit', () => {
    closeSync(requests);
    closeSync(answers);
    child.kill();
    rmSync(folder, { recursive: true, force: true });
  });
  const buffer = Buffer.alloc(1 << 16);
  let pending = Buffer.alloc(0);
  const readExactly = (size: number): Buffer => {
    while (pending.length < size) {
      const count = readSync(answers, buffer, 0, buffer.length, null);
      if (count === 0) throw new Error('the python interpreter of the tests ended unexpectedly');
      pending = Buffer.concat([pending, buffer.subarray(0, count)]);
    }
    const head = pending.subarray(0, size);
    pending = pending.subarray(size);
    return head;
  };
  const readLine = (): string => {
    let end = pending.indexOf(10);
    while (end < 0) {
      const count = readSync(answers, buffer, 0, buffer.length, null);
      if (count === 0) throw new Error('the python interpreter of the tests ended unexpectedly');
      pending = Buffer.concat([pending, buffer.subarray(0, count)]);
      end = pending.indexOf(10);
    }
    const line = pending.subarray(0, end).toString('ascii');
    pending = pending.subarray(end + 1);
    return line;
  };
  return {
    request(script, input) {
      const data = Buffer.from(JSON.stringify({ script, input }), 'utf8');
      const frame = Buffer.concat([Buffer.from(`${data.length}\n`, 'ascii'), data]);
      for (let offset = 0; offset < frame.length; ) offset += writeSync(requests, frame, offset);
      const size = Number(readLine());
      return JSON.parse(readExactly(size).toString('utf8')) as { output: string; error?: string };
    },
  };
}
