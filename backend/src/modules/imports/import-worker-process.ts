import { fork, type ChildProcess } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { logger } from '../../logger';
import { setRemoteWake } from './import-runner';

/**
 * Heap of the upload worker: a young generation large enough that a batch of rows dies young instead
 * of being promoted, and an old generation capped so garbage is collected rather than accumulated —
 * measured by the import benchmark (about 250 MB peak RSS for 250,000 and for 1,000,000 rows).
 */
export const IMPORT_WORKER_NODE_FLAGS = ['--max-semi-space-size=32', '--max-old-space-size=128'];

/**
 * Starts the upload worker as a child process of the app and restarts it if it dies (with a growing
 * pause); returns the stop function main.ts calls on SIGTERM.
 */
export function startImportWorkerProcess(): () => Promise<void> {
  const entry = fileURLToPath(new URL(`./import-worker.main${import.meta.url.endsWith('.js') ? '.js' : '.ts'}`, import.meta.url));
  let child: ChildProcess | null = null;
  let stopping = false;
  let pause = 1000;
  let timer: NodeJS.Timeout | null = null;
  const spawn = () => {
    const startedAt = Date.now();
    child = fork(entry, [], { execArgv: [...process.execArgv, ...IMPORT_WORKER_NODE_FLAGS], stdio: 'inherit' });
    setRemoteWake(() => child?.connected && child.send('wake'));
    child.on('exit', (code, signal) => {
      child = null;
      setRemoteWake(null);
      if (stopping) return;
      if (Date.now() - startedAt > 60_000) pause = 1000;
      logger.error(`upload worker exited (${signal ?? code}); restarting in ${pause / 1000} s`);
      timer = setTimeout(spawn, pause);
      pause = Math.min(pause * 2, 60_000);
    });
  };
  spawn();
  return async () => {
    stopping = true;
    if (timer) clearTimeout(timer);
    const c = child;
    if (!c) return;
    await new Promise<void>((resolve) => {
      const kill = setTimeout(() => c.kill('SIGKILL'), 15_000);
      c.once('exit', () => {
        clearTimeout(kill);
        resolve();
      });
      c.kill('SIGTERM');
    });
  };
}
