// Size of the JavaScript a first page load fetches (issue 5 target: ≤ 300 kB gzip), from a
// production build: the entry script of index.html, every modulepreload it names, and (to be sure
// nothing is missed) every chunk those import statically, followed transitively. Lazy chunks
// (pages, charts, workers) are listed apart, the largest first. gzip at zlib's default level, as
// a web server compresses on the fly.
// Run: node --import tsx bench/client-bundle.bench.ts [--client-dir dist/client]
//   (without --client-dir it builds into a temporary folder with the project's own vite config)
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { parseArgs } from 'node:util';
import { gzipSync } from 'node:zlib';

const root = fileURLToPath(new URL('..', import.meta.url));
const TARGET_KB = 300;
const LARGEST_LAZY = 10;
const { values: options } = parseArgs({ options: { 'client-dir': { type: 'string' } } });

const temporary = options['client-dir'] ? null : mkdtempSync('/tmp/rejectra-bundle-');
const clientDir = options['client-dir'] ? path.resolve(options['client-dir']) : path.join(temporary!, 'client');
try {
  if (temporary) {
    const built = spawnSync(path.join(root, 'node_modules', '.bin', 'vite'), ['build', '--outDir', clientDir, '--logLevel', 'warn'], { cwd: root, encoding: 'utf8' });
    if (built.status !== 0) throw new Error(`client build failed: ${built.stderr}`);
  }
  const indexHtml = path.join(clientDir, 'index.html');
  if (!existsSync(indexHtml)) throw new Error(`no index.html in ${clientDir}`);
  const html = readFileSync(indexHtml, 'utf8');

  // <script type="module" src="…"> and <link rel="modulepreload" href="…">, in any attribute order.
  const initial = new Set<string>();
  for (const tag of html.match(/<script\b[^>]*>/g) ?? []) {
    const source = /\bsrc="([^"]+)"/.exec(tag)?.[1];
    if (source?.endsWith('.js')) initial.add(source);
  }
  for (const tag of html.match(/<link\b[^>]*>/g) ?? []) {
    if (!/\brel="modulepreload"/.test(tag)) continue;
    const href = /\bhref="([^"]+)"/.exec(tag)?.[1];
    if (href) initial.add(href);
  }
  if (initial.size === 0) throw new Error('index.html names no script');

  const fileOf = (url: string) => path.join(clientDir, url.replace(/^\//, ''));
  // Static imports in minified output: `import{a as b}from"./x.js"`, `import"./x.js"`, `export{…}from"./x.js"`.
  // Dynamic `import("./x.js")` is lazy and not followed.
  const staticImport = /(?:\bimport|\bexport)\s*(?:[\w*${}\s,]+?\s*from\s*)?["']([^"']+\.js)["']/g;
  const firstLoad = new Set<string>();
  const queue = [...initial].map(fileOf);
  while (queue.length > 0) {
    const file = queue.pop()!;
    if (firstLoad.has(file) || !existsSync(file)) continue;
    firstLoad.add(file);
    const text = readFileSync(file, 'utf8');
    for (const match of text.matchAll(staticImport)) {
      const before = text.slice(Math.max(0, match.index - 1), match.index);
      if (before === '.') continue; // a property named import, not a statement
      queue.push(path.resolve(path.dirname(file), match[1]));
    }
  }

  const gzipKb = (file: string) => gzipSync(readFileSync(file)).length / 1024;
  const rawKb = (file: string) => statSync(file).size / 1024;
  const name = (file: string) => path.relative(clientDir, file);

  process.stdout.write(`client bundle: JavaScript of the first page load (index.html's script and modulepreloads, and their static imports), gzip\n`);
  let total = 0;
  let totalRaw = 0;
  for (const file of [...firstLoad].sort((a, b) => gzipKb(b) - gzipKb(a))) {
    const size = gzipKb(file);
    total += size;
    totalRaw += rawKb(file);
    process.stdout.write(`  ${name(file).padEnd(48)}${`${rawKb(file).toFixed(1)} kB`.padStart(11)}${`${size.toFixed(1)} kB gzip`.padStart(16)}\n`);
  }
  process.stdout.write(`first load: ${total.toFixed(1)} kB gzip (${totalRaw.toFixed(1)} kB raw) in ${firstLoad.size} file(s); target ≤ ${TARGET_KB} kB gzip: ${total <= TARGET_KB ? 'met' : 'MISSED'} (ratio ${(total / TARGET_KB).toFixed(2)})\n`);

  const assets = path.join(clientDir, 'assets');
  const lazy = readdirSync(assets)
    .filter((file) => file.endsWith('.js'))
    .map((file) => path.join(assets, file))
    .filter((file) => !firstLoad.has(file))
    .map((file) => ({ file, gzip: gzipKb(file), raw: rawKb(file) }))
    .sort((a, b) => b.gzip - a.gzip);
  process.stdout.write(`largest of ${lazy.length} lazy chunks (fetched when a page, chart or worker needs them):\n`);
  for (const chunk of lazy.slice(0, LARGEST_LAZY)) {
    process.stdout.write(`  ${name(chunk.file).padEnd(48)}${`${chunk.raw.toFixed(1)} kB`.padStart(11)}${`${chunk.gzip.toFixed(1)} kB gzip`.padStart(16)}\n`);
  }
  process.stdout.write(`lazy total: ${lazy.reduce((sum, chunk) => sum + chunk.gzip, 0).toFixed(1)} kB gzip\n`);
} finally {
  if (temporary) rmSync(temporary, { recursive: true, force: true });
}
