import { emptyProject, type PickEdit, type Project, type ProjectChoices, type ProjectInput } from '../../src/io/projectFile.js';
import { pickKey } from './compute.js';

/** Undo (past) and redo (future) steps: the project before or after each change, with its label. */
export interface SessionHistory {
  past: { project: Project; label: string }[];
  future: { project: Project; label: string }[];
}

/**
 * The session: the project now, and the projects before (undo) and after (redo) it. A project is
 * never changed in place; every edit makes a new one, so undo is keeping the old one.
 */
export class Session {
  project: Project = emptyProject();
  private past: { project: Project; label: string }[] = [];
  private future: { project: Project; label: string }[] = [];
  /** Called after every change, with what changed. */
  onChange: (label: string) => void = () => {};

  /** Replaces the whole session (restore or open), clearing undo. */
  reset(project: Project, label: string): void {
    this.project = project;
    this.past = [];
    this.future = [];
    this.onChange(label);
  }

  /** The undo and redo steps, oldest first (for saving with the session). */
  history(): SessionHistory {
    return { past: [...this.past], future: [...this.future] };
  }

  /** Puts back a session saved with its undo and redo steps (a reload). */
  restore(project: Project, history: SessionHistory, label: string): void {
    this.project = project;
    this.past = history.past.slice(-500);
    this.future = [...history.future];
    this.onChange(label);
  }

  apply(next: Project, label: string): void {
    this.past.push({ project: this.project, label });
    if (this.past.length > 500) this.past.shift();
    this.future = [];
    this.project = next;
    this.onChange(label);
  }

  canUndo(): boolean { return this.past.length > 0; }
  canRedo(): boolean { return this.future.length > 0; }
  undoLabel(): string | undefined { return this.past[this.past.length - 1]?.label; }
  redoLabel(): string | undefined { return this.future[this.future.length - 1]?.label; }

  undo(): void {
    const step = this.past.pop();
    if (!step) return;
    this.future.push({ project: this.project, label: step.label });
    this.project = step.project;
    this.onChange(`undo: ${step.label}`);
  }

  redo(): void {
    const step = this.future.pop();
    if (!step) return;
    this.past.push({ project: this.project, label: step.label });
    this.project = step.project;
    this.onChange(`redo: ${step.label}`);
  }

  /** Sets (time in seconds), clears (null) or, with undefined, removes the hand edit of a pick. */
  setPick(where: { file: string; trace?: number; row?: number }, time: number | null | undefined, label: string): void {
    const key = pickKey(where.file, where);
    const picks: PickEdit[] = this.project.picks.filter((p) => pickKey(p.file, p) !== key);
    if (time !== undefined) picks.push({ file: where.file, ...(where.trace !== undefined ? { trace: where.trace } : { row: where.row }), time });
    this.apply({ ...this.project, picks }, label);
  }

  setChoices(change: Partial<ProjectChoices>, label: string): void {
    this.apply({ ...this.project, choices: { ...this.project.choices, ...change } }, label);
  }

  /**
   * Adds files that have been read without error. A first-break table starts a new line (the
   * records or table before it go, with their picks and choices: undo brings them back); records
   * join the records of the line (a record of the same name replaces the old one); a station
   * table replaces the station table.
   */
  addInputs(files: ProjectInput[]): void {
    let { inputs, picks, choices } = this.project;
    for (const file of files) {
      if (file.kind === 'first-breaks' || (file.kind === 'seg2' && inputs.some((i) => i.kind === 'first-breaks'))) {
        inputs = inputs.filter((i) => file.kind === 'first-breaks' ? false : i.kind === 'stations');
        picks = [];
        choices = { segments: {}, breakpoints: {}, directThroughOrigin: false, poisson: choices.poisson };
      }
      if (file.kind === 'stations') inputs = inputs.filter((i) => i.kind !== 'stations');
      // A file given again replaces the one of the same name, and the hand picks made on the old one go.
      picks = picks.filter((p) => p.file !== file.name);
      inputs = [...inputs.filter((i) => i.name !== file.name), file];
    }
    const label = files.length === 1 ? `load ${files[0].name}` : `load ${files.length} files`;
    this.apply({ ...this.project, inputs, picks, choices }, label);
  }

  removeInput(name: string): void {
    this.apply({ ...this.project, inputs: this.project.inputs.filter((i) => i.name !== name), picks: this.project.picks.filter((p) => p.file !== name) }, `remove ${name}`);
  }
}
