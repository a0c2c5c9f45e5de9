/**
 * The production front end's initial JavaScript: the entry chunk(s) that index.html loads (module scripts
 * and their modulepreload links), gzip-compressed as a server would send them. Target ≤ 200 KB, so the
 * first screen opens quickly on a ward's phone; every screen is a lazy route of its own.
 * Builds into a temporary folder (the dist/ that the app serves is left alone).
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readdirSync, readFileSync, rmSync, statSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { gzipSync } from 'node:zlib';

const root = fileURLToPath(new URL('../../', import.meta.url));
const TARGET_KB = 200;

const kb = (bytes: number) => bytes / 1024;

export async function run(): Promise<void> {
  const out = mkdtempSync(path.join(os.tmpdir(), 'plenum-bundle-'));
  try {
    execFileSync(process.execPath, [path.join(root, 'node_modules/vite/bin/vite.js'), 'build', '--outDir', out, '--emptyOutDir', '--logLevel', 'error'], {
      cwd: root,
      stdio: ['ignore', 'ignore', 'inherit'],
    });
    const html = readFileSync(path.join(out, 'index.html'), 'utf8');
    const initial = new Set<string>();
    for (const m of html.matchAll(/<script[^>]*type="module"[^>]*src="([^"]+)"/g)) initial.add(m[1]);
    for (const m of html.matchAll(/<link[^>]*rel="modulepreload"[^>]*href="([^"]+)"/g)) initial.add(m[1]);
    if (initial.size === 0) throw new Error('index.html loads no module script');
    const files = [...initial].map((src) => {
      const bytes = readFileSync(path.join(out, src.replace(/^\//, '')));
      return { src, rawKb: kb(bytes.length), gzKb: kb(gzipSync(bytes, { level: 9 }).length) };
    });
    const gz = files.reduce((a, f) => a + f.gzKb, 0);
    const raw = files.reduce((a, f) => a + f.rawKb, 0);
    console.log(
      `bundle_initial_js_gzip: ${gz.toFixed(1)} KB in ${files.length} file(s), ${raw.toFixed(0)} KB before gzip (target ≤ ${TARGET_KB} KB; ratio ${(gz / TARGET_KB).toFixed(2)} of target)`,
    );
    for (const f of files.sort((a, b) => b.gzKb - a.gzKb)) console.log(`bundle_initial_file: ${f.src} ${f.gzKb.toFixed(1)} KB gzip (${f.rawKb.toFixed(0)} KB)`);
    // The rest loads on demand: the largest lazy chunks say where a screen's weight is.
    const assets = path.join(out, 'assets');
    const lazy = readdirSync(assets)
      .filter((f) => f.endsWith('.js') && !initial.has(`/assets/${f}`))
      .map((f) => ({ f, gzKb: kb(gzipSync(readFileSync(path.join(assets, f)), { level: 9 }).length), rawKb: kb(statSync(path.join(assets, f)).size) }))
      .sort((a, b) => b.gzKb - a.gzKb);
    console.log(
      `bundle_lazy_chunks: ${lazy.length} chunks, ${lazy.reduce((a, c) => a + c.gzKb, 0).toFixed(1)} KB gzip in all; largest ${lazy
        .slice(0, 3)
        .map((c) => `${c.f} ${c.gzKb.toFixed(1)} KB`)
        .join(', ')}`,
    );
  } finally {
    rmSync(out, { recursive: true, force: true });
  }
}
