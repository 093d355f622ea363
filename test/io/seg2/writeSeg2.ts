/**
 * A small SEG-2 writer for tests, written from the layout in ../shared/external/seg2/FORMAT.md
 * (Pullan 1990), independent of the program's reader. It covers what the real reference files do
 * not: big-endian files, data format codes 1, 4 and 5 (and 2 and 3), two-byte terminators.
 */
export interface WriterTrace {
  keywords: [string, string][];
  samples: number[];
  code: 1 | 2 | 3 | 4 | 5;
}

export interface WriterOptions {
  littleEndian?: boolean;
  stringTerminator?: number[];
  lineTerminator?: number[];
  fileKeywords?: [string, string][];
  /** Extra unused pointer slots, as real files have. */
  spareSlots?: number;
}

function strings(entries: [string, string][], terminator: number[], little: boolean): number[] {
  const out: number[] = [];
  for (const [k, v] of entries) {
    const text = [...Buffer.from(`${k} ${v}`, 'latin1')];
    const length = 2 + text.length + terminator.length;
    out.push(...(little ? [length & 0xff, length >> 8] : [length >> 8, length & 0xff]), ...text, ...terminator);
  }
  out.push(0, 0);
  while (out.length % 4 !== 0) out.push(0);
  return out;
}

function encode(samples: number[], code: number, little: boolean): Uint8Array {
  const size = { 1: 2, 2: 4, 3: 2.5, 4: 4, 5: 8 }[code]!;
  const bytes = new Uint8Array(Math.ceil(samples.length * size));
  const view = new DataView(bytes.buffer);
  samples.forEach((s, i) => {
    if (code === 1) view.setInt16(2 * i, s, little);
    if (code === 2) view.setInt32(4 * i, s, little);
    if (code === 4) view.setFloat32(4 * i, s, little);
    if (code === 5) view.setFloat64(8 * i, s, little);
  });
  if (code === 3) {
    for (let g = 0; g < samples.length / 4; g++) {
      let exponents = 0;
      const words: number[] = [];
      for (let j = 0; j < 4; j++) {
        let value = samples[4 * g + j];
        let e = 0;
        while (Math.abs(value) > 32767) { value /= 2; e++; }
        exponents |= e << (4 * j);
        const m = Math.trunc(value);
        words.push(m >= 0 ? m : (~(-m) & 0x7fff) | 0x8000);
      }
      view.setUint16(10 * g, exponents, little);
      words.forEach((w, j) => view.setUint16(10 * g + 2 + 2 * j, w, little));
    }
  }
  return bytes;
}

/** The bytes of a SEG-2 file with the given traces. */
export function writeSeg2(traces: WriterTrace[], options: WriterOptions = {}): Uint8Array {
  const little = options.littleEndian ?? true;
  const st = options.stringTerminator ?? [0];
  const lt = options.lineTerminator ?? [0x0a];
  const u16 = (v: number) => (little ? [v & 0xff, (v >> 8) & 0xff] : [(v >> 8) & 0xff, v & 0xff]);
  const u32 = (v: number) => (little ? [v & 0xff, (v >> 8) & 0xff, (v >> 16) & 0xff, (v >>> 24) & 0xff] : [(v >>> 24) & 0xff, (v >> 16) & 0xff, (v >> 8) & 0xff, v & 0xff]);
  const pointerBytes = 4 * (traces.length + (options.spareSlots ?? 0));
  const fileStrings = strings(options.fileKeywords ?? [['UNITS', 'METERS']], st, little);
  const header = [...u16(0x3a55), ...u16(1), ...u16(pointerBytes), ...u16(traces.length), st.length, st[0], st[1] ?? 0, lt.length, lt[0] ?? 0, lt[1] ?? 0, ...new Array(18).fill(0)];
  const blocks: number[][] = [];
  let offset = 32 + pointerBytes + fileStrings.length;
  const pointers: number[] = [];
  for (const t of traces) {
    const s = strings(t.keywords, st, little);
    const data = encode(t.samples, t.code, little);
    const descriptor = 32 + s.length;
    const block = [...u16(0x4422), ...u16(descriptor), ...u32(data.length), ...u32(t.samples.length), t.code, ...new Array(19).fill(0), ...s, ...data];
    pointers.push(offset);
    offset += block.length;
    blocks.push(block);
  }
  const pointerBlock = [...pointers.flatMap(u32), ...new Array(pointerBytes - 4 * pointers.length).fill(0)];
  return Uint8Array.from([...header, ...pointerBlock, ...fileStrings, ...blocks.flat()]);
}
