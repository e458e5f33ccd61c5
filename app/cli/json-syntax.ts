// Where a plan file stops being JSON (RFC 8259), for a message with line and column.

/** Deepest JSON nesting read; a plan needs 7 levels (zone coordinates). */
export const MAX_JSON_DEPTH = 100;

/** A character for a message: quoted when printable, else its code point. */
function showChar(c: string): string {
  const cp = c.codePointAt(0)!;
  return /[\p{L}\p{N}\p{P}\p{S}]/u.test(c)
    ? `'${c}'`
    : `U+${cp.toString(16).toUpperCase().padStart(4, '0')}`;
}

/**
 * The first JSON syntax error (RFC 8259) or nesting deeper than MAX_JSON_DEPTH, as a character
 * offset and reason; null when the text is well-formed. Iterative, so any depth is safe to scan.
 */
export function jsonSyntaxError(t: string): { at: number; why: string } | null {
  let i = 0;
  const stack: string[] = [];
  const bad = (why: string) => ({
    at: i,
    why:
      i >= t.length
        ? `${why}, but the file ends`
        : `${why}, found ${showChar(String.fromCodePoint(t.codePointAt(i)!))}`,
  });
  const skip = () => {
    while (i < t.length && (t[i] === ' ' || t[i] === '\t' || t[i] === '\n' || t[i] === '\r')) i++;
  };
  const str = (): { at: number; why: string } | null => {
    i++;
    while (i < t.length) {
      const c = t.charCodeAt(i);
      if (c === 0x22) {
        i++;
        return null;
      }
      if (c < 0x20) return bad('a control character must be escaped inside a string');
      if (c === 0x5c) {
        const e = t[i + 1];
        if (e === 'u' && /^[0-9a-fA-F]{4}$/.test(t.slice(i + 2, i + 6))) i += 6;
        else if (e !== undefined && '"\\/bfnrt'.includes(e)) i += 2;
        else {
          i++;
          return bad('not a valid escape after \\');
        }
      } else i++;
    }
    return bad('a string is not closed');
  };
  const key = () => {
    if (t[i] !== '"') return bad('expected a property name in double quotes');
    const f = str();
    if (f) return f;
    skip();
    if (t[i] !== ':') return bad("expected ':' after the property name");
    i++;
    return null;
  };
  const NUMBER = /-?(?:0|[1-9]\d*)(?:\.\d+)?(?:[eE][+-]?\d+)?/y;
  for (;;) {
    skip();
    const c = t[i];
    if (c === '{' || c === '[') {
      i++;
      skip();
      if (t[i] === (c === '{' ? '}' : ']')) i++;
      else {
        if (stack.length >= MAX_JSON_DEPTH) {
          i--;
          return { at: i, why: `nested deeper than ${MAX_JSON_DEPTH} levels` };
        }
        stack.push(c);
        if (c === '{') {
          const f = key();
          if (f) return f;
        }
        continue;
      }
    } else if (c === '"') {
      const f = str();
      if (f) return f;
    } else if (t.startsWith('true', i)) i += 4;
    else if (t.startsWith('false', i)) i += 5;
    else if (t.startsWith('null', i)) i += 4;
    else {
      NUMBER.lastIndex = i;
      if (!NUMBER.test(t)) return bad('expected a value');
      i = NUMBER.lastIndex;
    }
    // After a value: a comma, a closing bracket, or the end.
    for (;;) {
      skip();
      if (stack.length === 0) return i < t.length ? bad('expected the end of the file') : null;
      const top = stack[stack.length - 1];
      if (t[i] === ',') {
        i++;
        skip();
        if (top === '{') {
          const f = key();
          if (f) return f;
        }
        break;
      }
      if (t[i] === (top === '{' ? '}' : ']')) {
        i++;
        stack.pop();
        continue;
      }
      return bad(top === '{' ? "expected ',' or '}'" : "expected ',' or ']'");
    }
  }
}

/** 1-based line and column (in characters) of offset `at`. */
export function lineColumn(text: string, at: number): string {
  let line = 1;
  let start = 0;
  for (let k = text.indexOf('\n'); k >= 0 && k < at; k = text.indexOf('\n', k + 1)) {
    line++;
    start = k + 1;
  }
  return `line ${line}, column ${at - start + 1}`;
}
