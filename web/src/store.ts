import { emptyProject, readProjectFile, projectFileJson, type Project, type ProjectInput } from '../../src/io/projectFile.js';

// The session is kept in IndexedDB as the project document (the JSON of a saved project file)
// with the files beside it as bytes; a restore puts the document together and validates it as
// opening a file does.
const DATABASE = 'hammerline-field-app';
const STORE = 'session';
const KEY = 'current';

function open(): Promise<IDBDatabase> {
  return new Promise((resolve, reject) => {
    const request = indexedDB.open(DATABASE, 1);
    request.onupgradeneeded = () => request.result.createObjectStore(STORE);
    request.onsuccess = () => resolve(request.result);
    request.onerror = () => reject(request.error);
  });
}

let database: Promise<IDBDatabase> | undefined;

/** Writes the session; resolves once the transaction has committed. */
export async function saveSession(project: Project): Promise<void> {
  database ??= open();
  const db = await database;
  // The files go as bytes (structured clone is quick); the rest as the project document's JSON.
  const text = projectFileJson({ ...project, inputs: [] });
  const inputs = project.inputs.map((i) => ({ name: i.name, kind: i.kind, lengthUnit: i.lengthUnit, bytes: i.bytes }));
  await new Promise<void>((resolve, reject) => {
    const transaction = db.transaction(STORE, 'readwrite');
    transaction.objectStore(STORE).put({ text, inputs, saved: new Date().toISOString() }, KEY);
    transaction.oncomplete = () => resolve();
    transaction.onerror = () => reject(transaction.error);
    transaction.onabort = () => reject(transaction.error);
  });
}

/** The saved session, or undefined when there is none. Throws InputError when it cannot be read. */
export async function loadSession(): Promise<{ project: Project; saved: string } | undefined> {
  database ??= open();
  const db = await database;
  const value = await new Promise<{ text: string; inputs: ProjectInput[]; saved: string } | undefined>((resolve, reject) => {
    const request = db.transaction(STORE, 'readonly').objectStore(STORE).get(KEY);
    request.onsuccess = () => resolve(request.result as { text: string; inputs: ProjectInput[]; saved: string } | undefined);
    request.onerror = () => reject(request.error);
  });
  if (value === undefined) return undefined;
  // Validated as a project file would be: the whole document is put back together and read.
  const whole = { ...JSON.parse(value.text), inputs: JSON.parse(projectFileJson({ ...emptyProject(), inputs: value.inputs })).inputs };
  return { project: readProjectFile(JSON.stringify(whole), 'the saved session'), saved: value.saved };
}
