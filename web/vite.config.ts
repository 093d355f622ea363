import { readFileSync, readdirSync } from 'node:fs';
import { dirname, join, relative } from 'node:path';
import { fileURLToPath } from 'node:url';
import { defineConfig, type Plugin } from 'vite';

const webDir = dirname(fileURLToPath(import.meta.url));
const examplesDir = join(webDir, '..', 'survey-examples');

interface Example { id: string; title: string; files: string[] }

/** The bundled examples: each line's files, titled from the first line of its README. */
function examples(): Example[] {
  const list: Example[] = [];
  for (const folder of readdirSync(examplesDir, { withFileTypes: true }).filter((d) => d.isDirectory()).map((d) => d.name).sort()) {
    const readme = readFileSync(join(examplesDir, folder, 'README.md'), 'utf8');
    const title = (/^#\s+(.*)$/m.exec(readme)?.[1] ?? folder).trim();
    const files = readdirSync(join(examplesDir, folder)).filter((f) => f.endsWith('.csv')).sort();
    const records = join(examplesDir, folder, 'records');
    let recordFiles: string[] = [];
    try { recordFiles = readdirSync(records).filter((f) => /\.(seg2|sg2|dat)$/i.test(f)).sort(); } catch { /* no records */ }
    if (recordFiles.length > 0) list.push({ id: `${folder}-records`, title: `${title}: ${recordFiles.length} shot records (SEG-2)`, files: recordFiles.map((f) => `${folder}/records/${f}`) });
    for (const f of files) list.push({ id: `${folder}-${f.replace(/\.csv$/, '')}`, title: `${title}: ${f}`, files: [`${folder}/${f}`] });
  }
  return list;
}

/** Copies survey-examples/ into the build (examples/) with a manifest, and serves them in development. */
function bundledExamples(): Plugin {
  return {
    name: 'hammerline-examples',
    generateBundle() {
      const list = examples();
      this.emitFile({ type: 'asset', fileName: 'examples/index.json', source: JSON.stringify(list, null, 1) });
      for (const path of new Set(list.flatMap((e) => e.files))) {
        this.emitFile({ type: 'asset', fileName: `examples/${path}`, source: readFileSync(join(examplesDir, path)) });
      }
    },
    configureServer(server) {
      server.middlewares.use((request, response, next) => {
        const url = decodeURIComponent((request.url ?? '').split('?')[0]);
        if (!url.startsWith('/examples/')) return next();
        const path = url.slice('/examples/'.length);
        if (path === 'index.json') { response.setHeader('Content-Type', 'application/json'); response.end(JSON.stringify(examples())); return; }
        const file = join(examplesDir, path);
        if (relative(examplesDir, file).startsWith('..')) return next();
        try { response.end(readFileSync(file)); } catch { next(); }
      });
    },
  };
}

export default defineConfig({
  root: webDir,
  base: './',
  publicDir: false,
  plugins: [bundledExamples()],
  worker: { format: 'es' },
  build: { outDir: join(webDir, '..', 'dist', 'web'), emptyOutDir: true, target: 'es2022', chunkSizeWarningLimit: 8000, reportCompressedSize: false },
  server: { host: '127.0.0.1' },
  preview: { host: '127.0.0.1' },
});
