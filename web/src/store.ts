import { emptyProject, readProjectFile, projectFileJson, type Project, type ProjectInput } from '../../src/io/projectFile.js';
import type { SessionHistory } from './session.js';

// The session is kept in IndexedDB as the project document (the JSON of a saved project file)
// with the files beside it as bytes; a restore puts the document together and validates it as
// opening a file does. The undo and redo steps are kept with it: each step is a project document
// without its files, naming its files by their place in one list of every file the steps use
// (a file shared by many steps is stored once).
const DATABASE = 'hammerline-field-app';
const STORE = 'session';
const KEY = 'current';

interface StoredInput { name: string; kind: ProjectInput['kind']; lengthUnit: ProjectInput['lengthUnit']; bytes: Uint8Array }
interface StoredStep { label: string; text: string; inputs: number[] }
interface Stored {
  text: string;
  inputs: StoredInput[];
  saved: string;
  history?: { files: StoredInput[]; past: StoredStep[]; future: StoredStep[] };
}

function open(): Promise<IDBDatabase> {
  return new Promise((resolve, reject) => {
    const request = indexedDB.open(DATABASE, 1);
    request.onupgradeneeded = () => request.result.createObjectStore(STORE);
    request.onsuccess = () => resolve(request.result);
    request.onerror = () => reject(request.error);
  });
}

let database: Promise<IDBDatabase> | undefined;

const stored = (i: ProjectInput): StoredInput => ({ name: i.name, kind: i.kind, lengthUnit: i.lengthUnit, bytes: i.bytes });

/** The undo and redo steps with their files listed once (files are immutable: one object, one entry). */
function historyRecord(history: SessionHistory): Stored['history'] {
  const files: StoredInput[] = [];
  const index = new Map<ProjectInput, number>();
  const step = ({ project, label }: { project: Project; label: string }): StoredStep => ({
    label,
    text: projectFileJson({ ...project, inputs: [] }),
    inputs: project.inputs.map((input) => {
      let at = index.get(input);
      if (at === undefined) {
        at = files.length;
        files.push(stored(input));
        index.set(input, at);
      }
      return at;
    }),
  });
  return { past: history.past.map(step), future: history.future.map(step), files };
}

/** Writes the session and its undo and redo steps; resolves once the transaction has committed. */
export async function saveSession(project: Project, history: SessionHistory = { past: [], future: [] }): Promise<void> {
  database ??= open();
  const db = await database;
  // The files go as bytes (structured clone is quick); the rest as the project document's JSON.
  const text = projectFileJson({ ...project, inputs: [] });
  const value: Stored = { text, inputs: project.inputs.map(stored), saved: new Date().toISOString(), history: historyRecord(history) };
  await new Promise<void>((resolve, reject) => {
    const transaction = db.transaction(STORE, 'readwrite');
    transaction.objectStore(STORE).put(value, KEY);
    transaction.oncomplete = () => resolve();
    transaction.onerror = () => reject(transaction.error);
    transaction.onabort = () => reject(transaction.error);
  });
}

/** A stored project document and its files, validated as a project file is. */
function project(text: string, inputs: StoredInput[], name: string): Project {
  const whole = { ...JSON.parse(text), inputs: JSON.parse(projectFileJson({ ...emptyProject(), inputs })).inputs };
  return readProjectFile(JSON.stringify(whole), name);
}

/**
 * The saved session, or undefined when there is none. Throws InputError when it cannot be read.
 * Undo steps that cannot be read are not restored, and `historyProblem` says why.
 */
export async function loadSession(): Promise<{ project: Project; saved: string; history: SessionHistory; historyProblem?: string } | undefined> {
  database ??= open();
  const db = await database;
  const value = await new Promise<Stored | undefined>((resolve, reject) => {
    const request = db.transaction(STORE, 'readonly').objectStore(STORE).get(KEY);
    request.onsuccess = () => resolve(request.result as Stored | undefined);
    request.onerror = () => reject(request.error);
  });
  if (value === undefined) return undefined;
  const current = project(value.text, value.inputs, 'the saved session');
  let history: SessionHistory = { past: [], future: [] };
  let historyProblem: string | undefined;
  if (value.history !== undefined) {
    try {
      const { files } = value.history;
      const steps = (list: StoredStep[], which: string) => list.map((s, i) => {
        const missing = s.inputs.find((k) => files[k] === undefined);
        if (missing !== undefined) throw new Error(`${which} step ${i + 1} names a file that was not saved`);
        return { label: s.label, project: project(s.text, s.inputs.map((k) => files[k]), `${which} step ${i + 1} of the saved session`) };
      });
      history = { past: steps(value.history.past, 'undo'), future: steps(value.history.future, 'redo') };
    } catch (error) {
      historyProblem = (error as Error).message;
    }
  }
  return { project: current, saved: value.saved, history, historyProblem };
}
