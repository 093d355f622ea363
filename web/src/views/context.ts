import type { LengthUnit } from '../../../src/core/units.js';
import type { LineView } from '../compute.js';
import type { Session } from '../session.js';

export type TabName = 'records' | 'traveltime' | 'section' | 'site' | 'checks';

/** What a warning link or a click asks a view to bring forward. */
export interface Focus {
  record?: string;
  trace?: number;
  source?: string;
  layer?: number;
  anchor?: string;
}

/** What every view reads and the few things it may ask of the app. */
export interface AppContext {
  session: Session;
  /** The latest interpretation (undefined until one has succeeded). */
  line?: LineView;
  units: () => LengthUnit;
  /** The pick selected for keyboard edits, by key (see pickKey). */
  selected?: string;
  show: (tab: TabName, focus?: Focus) => void;
  /**
   * The time of a pick as the session holds it now (a hand edit, else the automatic or table
   * time), in seconds; undefined when cleared or unpicked. Keys use it, not the last
   * interpretation, so presses faster than the interpretation are never lost.
   */
  timeNow: (pick: { file: string; trace?: number; row?: number; autoTime?: number }) => number | undefined;
  /** Redraws the active view now (a selection changed, nothing to re-interpret). */
  refresh: () => void;
}

export interface View {
  /** Draws the view from ctx.line; resolves when the plots are on screen. */
  render: () => Promise<void>;
  /** Handles a key while the view is shown; true when it did. */
  onKey?: (event: KeyboardEvent) => boolean;
  focus?: (focus: Focus) => void;
  resize?: () => void;
}
