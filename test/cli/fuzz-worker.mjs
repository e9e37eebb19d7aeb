// Runs speedband's CLI in a worker thread for the command-line fuzz test (fuzz.test.ts), so that a run
// that never ends can be stopped (Worker.terminate) instead of hanging the test process.
import { parentPort } from 'node:worker_threads';
import { register } from 'tsx/esm/api';

register();
const { runCli } = await import('../../src/cli/main.ts');
const { recordingIo } = await import('../../src/cli/io.ts');

parentPort.on('message', async ({ id, args }) => {
  const io = recordingIo();
  let code;
  try {
    code = await runCli(args, io);
  } catch (error) {
    code = 3;
    io.stderr(String(error && error.stack ? error.stack : error));
  }
  parentPort.postMessage({ id, code, err: io.err().slice(0, 4000) });
});
parentPort.postMessage({ ready: true });
