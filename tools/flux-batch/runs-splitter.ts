/**
 * Walks a {"runs": [...]} document held in a Buffer and hands each run's JSON text to a
 * callback, one at a time. Why not one JSON.parse of the whole document: for 20 000 closures
 * (~55 MB) that keeps every parsed array alive until the end, and the garbage collector then
 * copies all of them between generations — measured as ~0.3 s of a ~1.5 s batch. Parsed one
 * run at a time, the arrays die young and cost almost nothing to collect.
 * The structure around the runs is checked here; each run and every other value is checked by
 * JSON.parse, so malformed input is always reported.
 */
export class MalformedJson extends Error {}

const QUOTE = 34, BACKSLASH = 92, LBRACE = 123, RBRACE = 125, LBRACKET = 91, RBRACKET = 93, COMMA = 44, COLON = 58;

function isSpace(c: number): boolean {
  return c === 32 || c === 10 || c === 13 || c === 9;
}

function skipSpace(buf: Uint8Array, pos: number): number {
  while (pos < buf.length && isSpace(buf[pos])) pos++;
  return pos;
}

/** Index just after the JSON value starting at `pos` (not validated; JSON.parse does that). */
function valueEnd(buf: Uint8Array, pos: number): number {
  const len = buf.length;
  const first = buf[pos];
  if (first === QUOTE) return stringEnd(buf, pos);
  if (first !== LBRACE && first !== LBRACKET) {
    while (pos < len) {
      const c = buf[pos];
      if (c === COMMA || c === RBRACE || c === RBRACKET || isSpace(c)) break;
      pos++;
    }
    return pos;
  }
  let depth = 0;
  while (pos < len) {
    const c = buf[pos];
    if (c === QUOTE) {
      pos = stringEnd(buf, pos);
      continue;
    }
    if (c === LBRACE || c === LBRACKET) depth++;
    else if (c === RBRACE || c === RBRACKET) {
      depth--;
      if (depth === 0) return pos + 1;
    }
    pos++;
  }
  throw new MalformedJson('Unexpected end of JSON input');
}

function stringEnd(buf: Uint8Array, pos: number): number {
  pos++;
  while (pos < buf.length) {
    const c = buf[pos];
    if (c === BACKSLASH) pos += 2;
    else if (c === QUOTE) return pos + 1;
    else pos++;
  }
  throw new MalformedJson('Unterminated string in JSON');
}

function expect(buf: Uint8Array, pos: number, code: number, what: string): number {
  if (pos >= buf.length) throw new MalformedJson('Unexpected end of JSON input');
  if (buf[pos] !== code) throw new MalformedJson(`expected ${what} at position ${pos}`);
  return pos + 1;
}

function parseSlice(buf: Buffer, start: number, end: number): unknown {
  try {
    return JSON.parse(buf.toString('utf8', start, end));
  } catch (err) {
    throw new MalformedJson(`${(err as Error).message} (in the value at position ${start})`);
  }
}

/**
 * Calls `onRun` for every element of the top-level "runs" array, in order. Returns false when
 * the document is valid JSON but has no "runs" array. Throws MalformedJson otherwise.
 */
export function forEachRun(buf: Buffer, onRun: (run: unknown) => void): boolean {
  let pos = skipSpace(buf, 0);
  if (pos >= buf.length) throw new MalformedJson('Unexpected end of JSON input');
  if (buf[pos] !== LBRACE) {
    parseSlice(buf, pos, buf.length); // valid JSON but not an object → caller reports the shape
    return false;
  }
  pos = skipSpace(buf, pos + 1);
  let sawRuns = false;
  if (buf[pos] === RBRACE) pos++;
  else {
    for (;;) {
      pos = skipSpace(buf, pos);
      if (buf[pos] !== QUOTE) throw new MalformedJson(`expected a key at position ${pos}`);
      const keyEnd = stringEnd(buf, pos);
      const key = parseSlice(buf, pos, keyEnd);
      pos = expect(buf, skipSpace(buf, keyEnd), COLON, "':'");
      pos = skipSpace(buf, pos);
      if (pos >= buf.length) throw new MalformedJson('Unexpected end of JSON input');
      if (key === 'runs' && buf[pos] === LBRACKET) {
        sawRuns = true;
        pos = eachElement(buf, pos, onRun);
      } else {
        const end = valueEnd(buf, pos);
        parseSlice(buf, pos, end);
        if (key === 'runs') sawRuns = false; // a later non-array "runs" wins, as in JSON.parse
        pos = end;
      }
      pos = skipSpace(buf, pos);
      if (buf[pos] === COMMA) {
        pos++;
        continue;
      }
      pos = expect(buf, pos, RBRACE, "',' or '}'");
      break;
    }
  }
  pos = skipSpace(buf, pos);
  if (pos !== buf.length) throw new MalformedJson(`unexpected data after the JSON document at position ${pos}`);
  return sawRuns;
}

function eachElement(buf: Buffer, pos: number, onRun: (run: unknown) => void): number {
  pos = skipSpace(buf, pos + 1);
  if (buf[pos] === RBRACKET) return pos + 1;
  for (;;) {
    pos = skipSpace(buf, pos);
    if (pos >= buf.length) throw new MalformedJson('Unexpected end of JSON input');
    const end = valueEnd(buf, pos);
    onRun(parseSlice(buf, pos, end));
    pos = skipSpace(buf, end);
    if (buf[pos] === COMMA) {
      pos++;
      continue;
    }
    return expect(buf, pos, RBRACKET, "',' or ']'");
  }
}
