/**
 * e2e global setup: build the renderer with Vite, serve the build with `vite preview` on a free
 * port of 127.0.0.1, hand the URL to the tests (inject('baseUrl')), stop the server afterwards.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { createServer } from 'node:net';
import { fileURLToPath } from 'node:url';
import type { TestProject } from 'vitest/node';

declare module 'vitest' {
  export interface ProvidedContext {
    baseUrl: string;
  }
}

const root = fileURLToPath(new URL('../..', import.meta.url));
const vite = fileURLToPath(new URL('../../node_modules/vite/bin/vite.js', import.meta.url));
const config = 'renderer/vite.config.ts';

function run(args: string[]): Promise<void> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [vite, ...args], { cwd: root, stdio: ['ignore', 'ignore', 'pipe'] });
    let stderr = '';
    child.stderr!.on('data', (chunk) => (stderr += chunk));
    child.on('error', reject);
    child.on('exit', (code) => (code === 0 ? resolve() : reject(new Error(`vite ${args[0]} failed (exit ${code}):\n${stderr}`))));
  });
}

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = createServer();
    server.unref();
    server.on('error', reject);
    server.listen(0, '127.0.0.1', () => {
      const address = server.address();
      const port = typeof address === 'object' && address ? address.port : 0;
      server.close(() => resolve(port));
    });
  });
}

async function waitForHttp(url: string, child: ChildProcess, timeout_ms: number): Promise<void> {
  const deadline = Date.now() + timeout_ms;
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`vite preview exited early (code ${child.exitCode})`);
    try {
      const response = await fetch(url);
      if (response.ok) return;
    } catch {
      /* not listening yet */
    }
    await new Promise((r) => setTimeout(r, 150));
  }
  throw new Error(`vite preview did not answer at ${url} within ${timeout_ms} ms`);
}

export default async function setup(project: TestProject): Promise<() => Promise<void>> {
  await run(['build', '--config', config, '--logLevel', 'warn']);
  const port = await freePort();
  const server = spawn(process.execPath, [vite, 'preview', '--config', config, '--host', '127.0.0.1', '--port', String(port), '--strictPort'], {
    cwd: root,
    stdio: 'ignore',
  });
  const url = `http://127.0.0.1:${port}/`;
  try {
    await waitForHttp(url, server, 20_000);
  } catch (error) {
    server.kill('SIGTERM');
    throw error;
  }
  project.provide('baseUrl', url);
  return async () => {
    if (server.exitCode !== null) return;
    const exited = new Promise((r) => server.once('exit', r));
    server.kill('SIGTERM');
    await Promise.race([exited, new Promise((r) => setTimeout(r, 3000))]);
    if (server.exitCode === null) server.kill('SIGKILL');
  };
}
