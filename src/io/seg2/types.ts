/** One trace of a SEG-2 record, as read. Times in seconds, positions in metres. */
export interface Seg2Trace {
  /** 1-based order of the trace in the file's pointer table. */
  index: number;
  /** Trace keywords as written (upper case), values with surrounding blanks removed. */
  keywords: Record<string, string>;
  /** Lines of the trace NOTE keyword. */
  notes: string[];
  formatCode: number;
  /** Decoded samples before descaling: integers for codes 1 to 3, floats for 4 and 5. */
  raw: Float64Array;
  /** DESCALING_FACTOR (1 when absent): raw × factor is the physical amplitude. */
  descalingFactor: number;
  /** raw × descalingFactor, as single precision for processing. */
  data: Float32Array;
  /** SAMPLE_INTERVAL, in seconds. */
  sampleInterval: number;
  /** DELAY, in seconds: the time of the first sample (negative before the trigger). */
  delay: number;
  /** STACK: shots summed into the trace (kept as written, samples not divided). */
  stack?: number;
  /** True when TRACE_TYPE is DEAD. */
  dead: boolean;
  /** SOURCE_LOCATION and RECEIVER_LOCATION converted to metres (1 to 3 numbers: x [y [z]]). */
  sourceLocation?: number[];
  receiverLocation?: number[];
  sourceStation?: number;
  receiverStation?: number;
  channel?: number;
}

/** A SEG-2 file: one shot record. */
export interface Seg2Record {
  file: string;
  byteOrder: 'little' | 'big';
  revision: number;
  /** File descriptor keywords. */
  keywords: Record<string, string>;
  notes: string[];
  /** UNITS of the coordinates and the factor to metres. */
  units: string;
  metresPerUnit: number;
  traces: Seg2Trace[];
  /** Readable remarks about oddities that did not stop the reading. */
  remarks: string[];
}
