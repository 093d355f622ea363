import type { Project, ProjectInput } from '../../src/io/projectFile.js';
import type { LineFailure, LineView } from './compute.js';
import type { WorkerRequest } from './worker.js';

export interface RunReply {
  view: LineView | LineFailure;
  workerMs: number;
}

type Pending = { resolve: (reply: { ok?: boolean; message?: string; view?: LineView | LineFailure; workerMs?: number }) => void };

/** The page's side of the interpretation worker: requests by id, inputs sent only when they change. */
export class WorkerClient {
  private worker = new Worker(new URL('./worker.ts', import.meta.url), { type: 'module' });
  private id = 0;
  private pending = new Map<number, Pending>();
  private sentInputs: ProjectInput[] | undefined;

  constructor() {
    this.worker.onmessage = (event: MessageEvent<{ id: number }>) => {
      const waiting = this.pending.get(event.data.id);
      this.pending.delete(event.data.id);
      waiting?.resolve(event.data as never);
    };
  }

  private send(request: WorkerRequest): Promise<{ ok?: boolean; message?: string; view?: LineView | LineFailure; workerMs?: number }> {
    return new Promise((resolve) => {
      this.pending.set(request.id, { resolve });
      this.worker.postMessage(request);
    });
  }

  /** Reads a file in the worker as its kind; resolves with the problem when it cannot be read. */
  async check(input: ProjectInput): Promise<{ ok: boolean; message?: string }> {
    const reply = await this.send({ type: 'check', id: ++this.id, input });
    return { ok: reply.ok === true, message: reply.message };
  }

  async run(project: Project): Promise<RunReply> {
    const inputs = project.inputs === this.sentInputs ? undefined : project.inputs;
    this.sentInputs = project.inputs;
    const reply = await this.send({ type: 'run', id: ++this.id, inputs, picks: project.picks, choices: project.choices, units: project.units });
    if (reply.view === undefined) this.sentInputs = undefined;
    return { view: reply.view ?? { ok: false, message: reply.message ?? 'the interpretation stopped' }, workerMs: reply.workerMs ?? 0 };
  }
}
