// YAML with positions: js-yaml's parser events carry source offsets, so one pass over them maps
// every field path to the place it was written, and the same events build the value.
import { parseEvents, constructFromEvents, getScalarValue, YAMLException, EVENT_ID, SCALAR_STYLE, type Event } from 'js-yaml';

export interface Located {
  /** Offset of the key (for mapping members) or of the value. */
  keyOffset: number;
  valueOffset: number;
}

export interface YamlSource {
  file: string;
  text: string;
  value: unknown;
  /** JSON-pointer-like path (`/geometry/cd`, `/0/quantity`) to offsets. */
  places: Map<string, Located>;
  lineStarts: number[];
}

export interface YamlFailure {
  file: string;
  line: number;
  column: number;
  reason: string;
}

/** Offsets where lines start. Line breaks are YAML's: LF, CRLF, or a lone CR (as js-yaml counts them). */
export function lineStartsOf(text: string): number[] {
  const starts = [0];
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c === 10 || (c === 13 && text.charCodeAt(i + 1) !== 10)) starts.push(i + 1);
  }
  return starts;
}

export function offsetToLineColumn(lineStarts: number[], offset: number): { line: number; column: number } {
  let lo = 0;
  let hi = lineStarts.length - 1;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if ((lineStarts[mid] ?? 0) <= offset) lo = mid;
    else hi = mid - 1;
  }
  return { line: lo + 1, column: offset - (lineStarts[lo] ?? 0) + 1 };
}

type Frame =
  | { type: 'map'; path: string; pendingKey: string | null; keyOffset: number }
  | { type: 'seq'; path: string; index: number };

function startOf(e: Event): number {
  // A quoted scalar's value starts after its quote; the place a reader looks for is the quote.
  if (e.type === EVENT_ID.SCALAR) return e.valueStart >= 0 && (e.style === SCALAR_STYLE.SINGLE_QUOTED || e.style === SCALAR_STYLE.DOUBLE_QUOTED) ? e.valueStart - 1 : e.valueStart;
  if (e.type === EVENT_ID.MAPPING || e.type === EVENT_ID.SEQUENCE) return e.start;
  if (e.type === EVENT_ID.ALIAS) return e.anchorStart;
  return 0;
}

function mapPlaces(text: string, events: Event[]): Map<string, Located> {
  let documents = 0;
  const places = new Map<string, Located>();
  const stack: Frame[] = [];
  const childPath = (): { path: string; keyOffset: number } | null => {
    const top = stack[stack.length - 1];
    if (!top) return { path: '', keyOffset: -1 };
    if (top.type === 'seq') return { path: `${top.path}/${top.index++}`, keyOffset: -1 };
    if (top.pendingKey === null) return null; // this node is a key
    const p = { path: `${top.path}/${escapePointer(top.pendingKey)}`, keyOffset: top.keyOffset };
    top.pendingKey = null;
    return p;
  };
  for (const e of events) {
    if (e.type === EVENT_ID.DOCUMENT) {
      if (++documents > 1) break; // only one document is read (a second is reported apart)
      continue;
    }
    if (e.type === EVENT_ID.POP) {
      stack.pop();
      continue;
    }
    const top = stack[stack.length - 1];
    const where = childPath();
    if (where === null && top && top.type === 'map') {
      // A key: remember it for the value that follows.
      // The key as the value holds it (quotes and escapes decoded), so paths match the parsed value.
      const key = e.type === EVENT_ID.SCALAR ? getScalarValue(text, e) : '?';
      top.pendingKey = key;
      top.keyOffset = startOf(e);
      if (e.type === EVENT_ID.MAPPING || e.type === EVENT_ID.SEQUENCE) stack.push({ type: 'seq', path: '/?', index: 0 });
      continue;
    }
    const at = startOf(e);
    const path = where?.path ?? '';
    places.set(path, { keyOffset: where && where.keyOffset >= 0 ? where.keyOffset : at, valueOffset: at });
    if (e.type === EVENT_ID.MAPPING) stack.push({ type: 'map', path, pendingKey: null, keyOffset: -1 });
    else if (e.type === EVENT_ID.SEQUENCE) stack.push({ type: 'seq', path, index: 0 });
  }
  return places;
}

function escapePointer(s: string): string {
  return s.replace(/~/g, '~0').replace(/\//g, '~1');
}

/** Parse one YAML document with positions; a syntax error comes back as data. */
export function parseYamlSource(file: string, text: string): YamlSource | YamlFailure {
  const lineStarts = lineStartsOf(text);
  try {
    const events = parseEvents(text, { filename: file });
    const docs = constructFromEvents(events, { source: text, filename: file });
    if (docs.length > 1) {
      const at = secondDocument(text, events, lineStarts);
      return { file, ...at, reason: 'a handbook file holds one YAML document; a second one starts here' };
    }
    return { file, text, value: docs[0] ?? null, places: mapPlaces(text, events), lineStarts };
  } catch (err) {
    if (err instanceof YAMLException) {
      const mark = err.mark;
      const line = (mark?.line ?? 0) + 1;
      // A tab in a line's indentation is the usual cause of a failure on that line, though the
      // parser's own reason rarely says so ("end of the stream or a document separator is expected").
      const text0 = text.slice(lineStarts[line - 1] ?? 0, lineStarts[line] ?? text.length);
      const tab = /^[ ]*\t/.exec(text0);
      if (tab) return { file, line, column: tab[0].length, reason: 'a tab in the indentation: YAML indents with spaces only' };
      // A mark past the end of the text (an unclosed bracket at the end of the file) is placed at the
      // end of the last line, which a reader can go to.
      if (line > lineStarts.length) {
        const last = lineStarts.length;
        return { file, line: last, column: text.length - (lineStarts[last - 1] ?? 0) + 1, reason: err.reason };
      }
      return { file, line, column: (mark?.column ?? 0) + 1, reason: err.reason };
    }
    throw err;
  }
}

/** Where the second document of a stream starts: its "---" line, or its first node. */
function secondDocument(text: string, events: Event[], lineStarts: number[]): { line: number; column: number } {
  let documents = 0;
  for (const e of events) {
    if (e.type === EVENT_ID.DOCUMENT) {
      documents++;
      continue;
    }
    if (documents < 2 || e.type === EVENT_ID.POP) continue;
    const node = startOf(e);
    if (node < 0) break;
    const separator = text.lastIndexOf('\n---', node);
    const at = separator >= 0 ? separator + 1 : node;
    return offsetToLineColumn(lineStarts, at);
  }
  const separator = text.indexOf('\n---');
  return separator >= 0 ? offsetToLineColumn(lineStarts, separator + 1) : { line: 1, column: 1 };
}

export function isYamlFailure(x: YamlSource | YamlFailure): x is YamlFailure {
  return (x as YamlFailure).reason !== undefined;
}

/** Position of a pointer path; falls back to the nearest enclosing node that was written. */
export function positionOf(src: YamlSource, pointer: string, at: 'key' | 'value' = 'value'): { line: number; column: number } {
  let p = pointer;
  for (;;) {
    const loc = src.places.get(p);
    // An empty value ("pitch:" with nothing after it) has no offset of its own: use its key's place,
    // and for an item with neither ("-" alone, a bare tag "!"), the parent's.
    const own = loc ? (at === 'key' ? loc.keyOffset : loc.valueOffset) : -1;
    const offset = own >= 0 ? own : (loc?.keyOffset ?? -1);
    if (offset >= 0) return offsetToLineColumn(src.lineStarts, offset);
    if (p === '') return { line: 1, column: 1 };
    p = p.slice(0, p.lastIndexOf('/'));
  }
}

/** `/geometry/cd` → `geometry.cd`; `/0/quantity` → `[0].quantity`. */
export function pointerToField(pointer: string): string {
  let out = '';
  for (const raw of pointer.split('/').slice(1)) {
    const seg = raw.replace(/~1/g, '/').replace(/~0/g, '~');
    if (/^\d+$/.test(seg)) out += `[${seg}]`;
    else out += out ? `.${seg}` : seg;
  }
  return out;
}
