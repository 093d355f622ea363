import './style.css';
import { InputError } from '../../src/core/errors.js';
import { fromMetres, type LengthUnit } from '../../src/core/units.js';
import { projectFileJson, readProjectFile, type ProjectInput } from '../../src/io/projectFile.js';
import { classify } from './files.js';
import { escapeHtml, length, velocity } from './format.js';
import { Session } from './session.js';
import { loadSession, saveSession } from './store.js';
import { checksView } from './views/checks.js';
import type { AppContext, Focus, TabName, View } from './views/context.js';
import { recordsView } from './views/records.js';
import { sectionView } from './views/section.js';
import { siteView } from './views/site.js';
import { traveltimeView } from './views/traveltime.js';
import { WorkerClient } from './workerClient.js';

const $ = <T extends HTMLElement = HTMLElement>(id: string) => document.getElementById(id) as T;

const session = new Session();
const client = new WorkerClient();
const ctx: AppContext = {
  session,
  units: () => session.project.units,
  show: (tab, focus) => showTab(tab, focus),
  refresh: () => { void renderActive(); },
  timeNow: (pick) => {
    const edit = session.project.picks.find((p) => p.file === pick.file && (pick.trace !== undefined ? p.trace === pick.trace : p.row === pick.row));
    return edit ? (edit.time ?? undefined) : pick.autoTime;
  },
};

const views: Record<TabName, View> = {
  records: recordsView($('view-records'), ctx),
  traveltime: traveltimeView($('view-traveltime'), ctx),
  section: sectionView($('view-section'), ctx),
  site: siteView($('view-site'), ctx),
  checks: checksView($('view-checks'), ctx),
};
let active: TabName = 'traveltime';
const stale = new Set<TabName>(Object.keys(views) as TabName[]);

// ---- revisions: every change has a number; the page says which it has drawn and saved ----
let revision = 0;
let editStarted = 0;
let running = false;
let again = false;

session.onChange = (label) => {
  revision++;
  editStarted = performance.now();
  document.body.dataset.revision = String(revision);
  updateButtons();
  $('status-edit').textContent = label;
  const saving = revision;
  void saveSession(session.project, session.history()).then(
    () => { if (saving === revision) { document.body.dataset.savedRevision = String(saving); $('status-saved').textContent = `saved on this device at ${new Date().toLocaleTimeString()}`; } },
    (error: Error) => { $('status-saved').textContent = `NOT saved on this device (${error.message}); save a project file`; },
  );
  void recompute();
};

async function recompute(): Promise<void> {
  if (running) { again = true; return; }
  running = true;
  try {
    do {
      again = false;
      const drawing = revision;
      const started = editStarted;
      const reply = await client.run(session.project);
      if (again) continue;
      if (reply.view.ok) {
        ctx.line = reply.view;
        $('line-message').hidden = true;
      } else {
        ctx.line = undefined;
        showLineMessage(reply.view.message);
      }
      for (const name of Object.keys(views) as TabName[]) stale.add(name);
      renderSide();
      await renderActive();
      const elapsed = performance.now() - started;
      document.body.dataset.renderedRevision = String(drawing);
      document.body.dataset.editMs = elapsed.toFixed(1);
      if (reply.view.ok) document.body.dataset.interpretMs = reply.view.milliseconds.interpretation.toFixed(1);
      $('status-timing').textContent = reply.view.ok
        ? `interpreted in ${reply.view.milliseconds.interpretation.toFixed(0)} ms; change to redraw ${elapsed.toFixed(0)} ms`
        : '';
    } while (again);
  } finally {
    running = false;
  }
}

function showLineMessage(message: string): void {
  const box = $('line-message');
  box.hidden = false;
  box.textContent = session.project.inputs.length === 0 ? 'Load the SEG-2 records of a line, or a first-break table, to begin (or try a bundled example).' : `Not interpreted: ${message}`;
}

async function renderActive(): Promise<void> {
  stale.delete(active);
  await views[active].render();
}

function showTab(tab: TabName, focus?: Focus): void {
  active = tab;
  for (const name of Object.keys(views) as TabName[]) {
    $(`view-${name}`).hidden = name !== tab;
    const button = document.querySelector(`[data-tab="${name}"]`)!;
    button.setAttribute('aria-selected', String(name === tab));
  }
  if (focus) views[tab].focus?.(focus);
  void renderActive().then(() => views[tab].resize?.());
}

// ---- the side panel: the line at a glance ----
function renderSide(): void {
  const unit = session.project.units;
  const line = ctx.line;
  const inputs = session.project.inputs;
  $('inputs').innerHTML = inputs.length === 0 ? '<li class="hint">No files yet.</li>' : inputs.map((i) => `<li><span>${escapeHtml(i.name)}</span> <small>${i.kind === 'seg2' ? 'SEG-2 record' : i.kind === 'stations' ? `station table (${i.lengthUnit})` : `first-break table (${i.lengthUnit})`}</small> <button type="button" class="link" data-remove="${escapeHtml(i.name)}" aria-label="Remove ${escapeHtml(i.name)}">remove</button></li>`).join('');
  $('line-name').textContent = line ? line.name : '';
  $<HTMLDetailsElement>('examples-box').open = inputs.length === 0;
  const summary = $('line-summary');
  if (!line) { summary.innerHTML = ''; return; }
  const r = line.result;
  summary.innerHTML =
    `<p>${r.wave}-wave line; ${r.picksUsed} of ${r.picksTotal} picks in the fits; line-fit RMS ${(r.fitRmsSeconds * 1e3).toFixed(2)} ms.</p>` +
    `<table id="layers"><thead><tr><th>layer</th><th>velocity (${unit === 'ft' ? 'ft/s' : 'm/s'})</th></tr></thead><tbody>${r.layers.map((l) => `<tr data-layer="${l.index}"><td>${l.index}</td><td class="velocity">${velocity(l.velocity, l.velocitySe, unit).replace(/ (m|ft)\/s$/, '')}${l.reversed ? '' : ' <abbr title="seen from one side only: apparent velocity">unreversed</abbr>'}</td></tr>`).join('')}</tbody></table>` +
    `<table id="refractors"><thead><tr><th>refractor</th><th>depth below ground</th></tr></thead><tbody>${r.refractors.map((f) => {
      const depths = f.points.map((p) => p.depth);
      return `<tr data-refractor="${f.index}"><td>${f.index}</td><td>${depths.length ? `${fromMetres(Math.min(...depths), unit).toFixed(1)} to ${length(Math.max(...depths), unit, 1)}` : '–'} <small>(${escapeHtml(f.method)})</small></td></tr>`;
    }).join('')}</tbody></table>` +
    (r.site ? `<p id="side-site">v<sub>s,30</sub> ${velocity(r.site.vs30, undefined, unit)}${r.site.estimated ? ' (estimated)' : ''}: ${r.site.classes.map((c) => `${escapeHtml(c.standard)} ${escapeHtml(c.class)}${c.probability === undefined ? '' : ` (${Math.round(c.probability * 100)} %)`}`).join(', ')}</p>` : '') +
    `<p><button type="button" class="link" id="side-warnings">${r.warnings.length} warning${r.warnings.length === 1 ? '' : 's'}</button>; every depth and class carries the cautions shown with it.</p>`;
  $('side-warnings').addEventListener('click', () => showTab('checks', { anchor: 'warnings' }));
}

$('inputs').addEventListener('click', (event) => {
  const name = (event.target as HTMLElement).closest('[data-remove]')?.getAttribute('data-remove');
  if (name) session.removeInput(name);
});

// ---- loading files ----
function problem(messages: string[], unchanged: boolean): void {
  const box = $('message');
  if (messages.length === 0) { box.hidden = true; return; }
  box.hidden = false;
  box.innerHTML = `<b>${messages.length === 1 ? 'A file was not loaded' : `${messages.length} files were not loaded`}${unchanged ? '; the session is unchanged' : ''}.</b><ul>${messages.map((m) => `<li>${escapeHtml(m)}</li>`).join('')}</ul><button type="button" class="link" id="message-close">dismiss</button>`;
  $('message-close').addEventListener('click', () => { box.hidden = true; });
}

async function loadFiles(files: { name: string; bytes: Uint8Array }[]): Promise<void> {
  const accepted: ProjectInput[] = [];
  const problems: string[] = [];
  const tableUnit = $<HTMLSelectElement>('table-unit').value as LengthUnit;
  for (const file of files) {
    try {
      const found = classify(file.name, file.bytes, tableUnit);
      if (found.kind === 'project') {
        openProject(found.text, found.name, problems);
        continue;
      }
      const check = await client.check(found.input);
      if (check.ok) accepted.push(found.input);
      else problems.push(check.message ?? `${file.name}: could not be read`);
    } catch (error) {
      problems.push(error instanceof InputError ? error.message : `${file.name}: ${(error as Error).message}`);
    }
  }
  problem(problems, accepted.length === 0);
  if (accepted.length > 0) {
    const first = session.project.inputs.length === 0;
    session.addInputs(accepted);
    if (first) showTab(accepted.some((i) => i.kind === 'seg2') ? 'records' : 'traveltime');
  }
}

function openProject(text: string, name: string, problems: string[]): void {
  try {
    const project = readProjectFile(text, name);
    session.apply(project, `open ${name}`);
  } catch (error) {
    problems.push(error instanceof InputError ? error.message : `${name}: ${(error as Error).message}`);
  }
}

async function readFiles(list: FileList | File[]): Promise<void> {
  const files = await Promise.all([...list].map(async (f) => ({ name: f.name, bytes: new Uint8Array(await f.arrayBuffer()) })));
  await loadFiles(files);
}

$<HTMLInputElement>('file-input').addEventListener('change', (event) => {
  const input = event.target as HTMLInputElement;
  if (input.files) void readFiles(input.files).then(() => { input.value = ''; });
});
window.addEventListener('dragover', (event) => { event.preventDefault(); document.body.classList.add('dropping'); });
window.addEventListener('dragleave', (event) => { if (event.relatedTarget === null) document.body.classList.remove('dropping'); });
window.addEventListener('drop', (event) => {
  event.preventDefault();
  document.body.classList.remove('dropping');
  if (event.dataTransfer?.files.length) void readFiles(event.dataTransfer.files);
});

// ---- bundled examples (copied into the build, served from this origin) ----
interface Example { id: string; title: string; files: string[] }
async function loadExamples(): Promise<void> {
  const list = $('examples');
  try {
    const examples = (await (await fetch('examples/index.json')).json()) as Example[];
    list.replaceChildren(...examples.map((example) => {
      const button = document.createElement('button');
      button.type = 'button';
      button.dataset.example = example.id;
      button.textContent = example.title;
      button.addEventListener('click', async () => {
        const files = await Promise.all(example.files.map(async (path) => ({ name: path.split('/').pop()!, bytes: new Uint8Array(await (await fetch(`examples/${path}`)).arrayBuffer()) })));
        await loadFiles(files);
      });
      return button;
    }));
  } catch {
    list.textContent = 'The bundled examples are not in this build.';
  }
}

// ---- undo, redo, units, save, export ----
function updateButtons(): void {
  const undo = $<HTMLButtonElement>('undo');
  const redo = $<HTMLButtonElement>('redo');
  undo.disabled = !session.canUndo();
  redo.disabled = !session.canRedo();
  undo.title = session.undoLabel() ? `Undo ${session.undoLabel()} (Ctrl+Z)` : 'Nothing to undo';
  redo.title = session.redoLabel() ? `Redo ${session.redoLabel()} (Ctrl+Y)` : 'Nothing to redo';
  $<HTMLSelectElement>('units').value = session.project.units;
}
$('undo').addEventListener('click', () => session.undo());
$('redo').addEventListener('click', () => session.redo());
$<HTMLSelectElement>('units').addEventListener('change', (event) => {
  const units = (event.target as HTMLSelectElement).value as LengthUnit;
  if (units !== session.project.units) session.apply({ ...session.project, units }, `lengths in ${units === 'ft' ? 'feet' : 'metres'}`);
});

function download(name: string, text: string, type: string): void {
  const url = URL.createObjectURL(new Blob([text], { type }));
  const link = document.createElement('a');
  link.href = url;
  link.download = name;
  document.body.append(link);
  link.click();
  link.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}
const stem = () => (ctx.line?.name ?? 'line').replace(/ and \d+ more records?$/, '').replace(/\.[^.]*$/, '');
$('save').addEventListener('click', () => download(`${stem()}.hammerline.json`, projectFileJson(session.project), 'application/json'));
$<HTMLInputElement>('project-input').addEventListener('change', async (event) => {
  const input = event.target as HTMLInputElement;
  const file = input.files?.[0];
  if (!file) return;
  const problems: string[] = [];
  openProject(await file.text(), file.name, problems);
  problem(problems, true);
  input.value = '';
});
for (const id of ['export-picks', 'export-json', 'export-depths']) $(id).addEventListener('click', () => $('export-menu').removeAttribute('open'));
$('export-picks').addEventListener('click', () => ctx.line && download(ctx.line.exports.picksName, ctx.line.exports.picksCsv, 'text/csv'));
$('export-json').addEventListener('click', () => ctx.line && download(`${stem()}-interpretation.json`, ctx.line.exports.interpretationJson, 'application/json'));
$('export-depths').addEventListener('click', () => ctx.line && download(`${stem()}-depths.csv`, ctx.line.exports.depthsCsv, 'text/csv'));

// ---- tabs and keys ----
for (const button of document.querySelectorAll<HTMLButtonElement>('[data-tab]')) button.addEventListener('click', () => showTab(button.dataset.tab as TabName));
document.addEventListener('keydown', (event) => {
  const target = event.target as HTMLElement;
  if (target.closest('input, select, textarea')) return;
  if ((event.ctrlKey || event.metaKey) && event.key.toLowerCase() === 'z') { event.preventDefault(); if (event.shiftKey) session.redo(); else session.undo(); return; }
  if ((event.ctrlKey || event.metaKey) && event.key.toLowerCase() === 'y') { event.preventDefault(); session.redo(); return; }
  if (event.ctrlKey || event.metaKey || event.altKey) return;
  const tabs: TabName[] = ['records', 'traveltime', 'section', 'site', 'checks'];
  if (/^[1-5]$/.test(event.key)) { showTab(tabs[Number(event.key) - 1]); return; }
  if (views[active].onKey?.(event)) event.preventDefault();
});
window.addEventListener('resize', () => views[active].resize?.());

// ---- start: restore the session saved on this device ----
async function start(): Promise<void> {
  updateButtons();
  void loadExamples();
  try {
    const saved = await loadSession();
    if (saved) {
      session.restore(saved.project, saved.history, `restored the session saved at ${new Date(saved.saved).toLocaleString()}`);
      if (saved.historyProblem) $('status-edit').textContent = `Session restored; its undo steps could not be (${saved.historyProblem}): undo starts from here.`;
      showTab(saved.project.inputs.some((i) => i.kind === 'seg2') ? 'records' : 'traveltime');
    } else {
      showLineMessage('');
      showTab(active);
    }
  } catch (error) {
    problem([`The session saved on this device could not be restored: ${(error as Error).message}`], true);
    showLineMessage('');
    showTab(active);
  }
  document.body.dataset.ready = 'true';
}
void start();
