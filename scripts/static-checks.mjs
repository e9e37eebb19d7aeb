// The checks `npm test` runs before the tests: the linter and formatter (`npm run lint`) and the type check
// (`npm run typecheck`), side by side — neither reads what the other writes, and together they take the time of the
// slower. Each one's output is printed whole, in that order; the exit code is non-zero when either fails.
import { spawn } from 'node:child_process';
import { delimiter } from 'node:path';
import { fileURLToPath } from 'node:url';

/** The project's own tools first on the path (as npm puts them when it runs a script). */
const PATH = `${fileURLToPath(new URL('../node_modules/.bin', import.meta.url))}${delimiter}${process.env.PATH ?? ''}`;

const CHECKS = [
  ['biome', ['check']],
  ['tsc', ['-p', 'tsconfig.test.json']],
];

function run([command, args]) {
  return new Promise((resolve) => {
    const child = spawn(command, args, { stdio: ['ignore', 'pipe', 'pipe'], env: { ...process.env, PATH } });
    const output = [];
    child.stdout.on('data', (chunk) => output.push(chunk));
    child.stderr.on('data', (chunk) => output.push(chunk));
    child.on('error', (error) => resolve({ code: 1, output: [Buffer.from(`${command}: ${error.message}\n`)] }));
    child.on('close', (code) => resolve({ code: code ?? 1, output }));
  });
}

const results = await Promise.all(CHECKS.map(run));
for (const { output } of results) process.stdout.write(Buffer.concat(output));
process.exitCode = results.some(({ code }) => code !== 0) ? 1 : 0;
