// The interpretation runs here, off the page's thread, with the same src/ code as the command line.
import { InputError } from '../../src/core/errors.js';
import type { PickEdit, ProjectChoices, ProjectInput } from '../../src/io/projectFile.js';
import type { LengthUnit } from '../../src/core/units.js';
import { checkInput, computeLine, LineCache } from './compute.js';

export type WorkerRequest =
  | { type: 'run'; id: number; inputs?: ProjectInput[]; picks: PickEdit[]; choices: ProjectChoices; units: LengthUnit }
  | { type: 'check'; id: number; input: ProjectInput };

const cache = new LineCache();
// The worker's global scope (typed here without the WebWorker library, which clashes with DOM's).
const scope = self as unknown as { onmessage: (event: MessageEvent<WorkerRequest>) => void; postMessage: (message: unknown) => void };
const postMessage = (message: unknown) => scope.postMessage(message);

scope.onmessage = (event: MessageEvent<WorkerRequest>) => {
  const request = event.data;
  try {
    if (request.type === 'check') {
      checkInput(request.input);
      postMessage({ id: request.id, ok: true });
      return;
    }
    if (request.inputs !== undefined) cache.setInputs(request.inputs);
    const started = performance.now();
    const view = computeLine(cache, request.picks, request.choices, request.units);
    postMessage({ id: request.id, view, workerMs: performance.now() - started });
  } catch (error) {
    const message = error instanceof InputError ? error.message : `internal error (please report it with the files that caused it): ${(error as Error).message}`;
    postMessage({ id: request.id, ok: false, view: { ok: false, message }, message });
  }
};
