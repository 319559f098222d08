import { HexsalvageInputError, type InputErrorCode } from './errors.js';

/** Largest input file read (netlists, claims): 1 MiB. */
export const MAX_INPUT_BYTES = 1024 * 1024;
/** Deepest nesting of arrays and objects accepted in an input file. */
export const MAX_INPUT_DEPTH = 64;

/**
 * Parses the text of a JSON input document strictly, with no file system involved (the explorer
 * page reads files the user opens): an optional byte-order mark, nesting at most
 * {@link MAX_INPUT_DEPTH} deep, no duplicate keys in an object (JSON.parse would keep the last one
 * silently). Messages name the document and the line and column, never its content.
 *
 * @param text - the document's text (already decoded from UTF-8)
 * @param shown - how the document is named in messages (as the user gave it)
 * @param code - error family for the messages
 * @returns the parsed document
 * @throws HexsalvageInputError on any of the above
 * @example
 * ```ts
 * parseJsonText('{"name": "leg"}', 'leg.json', 'netlist');
 * ```
 */
export function parseJsonText(text: string, shown: string, code: InputErrorCode): unknown {
  const bad = (key: string, expected: string) => new HexsalvageInputError(code, shown, key, expected);
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  checkJson(body, bad);
  return JSON.parse(body) as unknown;
}

// A strict JSON scanner: finds the first syntax error (by line and column), nesting beyond the
// limit and duplicate keys, so that JSON.parse afterwards cannot fail and its messages, which quote
// the input, are never shown.
function checkJson(text: string, bad: (key: string, expected: string) => HexsalvageInputError): void {
  let i = 0;
  const where = (at: number) => {
    const before = text.slice(0, at);
    const line = before.split('\n').length;
    return `line ${line}, column ${at - before.lastIndexOf('\n')}`;
  };
  const fail = (what: string): never => {
    throw bad('(document)', `valid JSON (${what} at ${where(Math.min(i, text.length))})`);
  };
  const ws = () => {
    while (i < text.length && ' \t\n\r'.includes(text[i] as string)) i++;
  };
  const str = (): string => {
    const start = ++i;
    while (i < text.length) {
      const c = text.charCodeAt(i);
      if (c === 0x22) return JSON.parse(text.slice(start - 1, ++i)) as string;
      if (c < 0x20) fail('a control character inside a string');
      if (c === 0x5c) {
        const e = text[i + 1];
        if (e === 'u') {
          if (!/^[0-9a-fA-F]{4}$/.test(text.slice(i + 2, i + 6))) fail('a bad \\u escape');
          i += 6;
        } else if (e !== undefined && '"\\/bfnrt'.includes(e)) i += 2;
        else fail('a bad escape');
      } else i++;
    }
    return fail('an unterminated string');
  };
  const value = (depth: number): void => {
    if (depth > MAX_INPUT_DEPTH) throw bad('(document)', `nesting at most ${MAX_INPUT_DEPTH} deep (at ${where(i)})`);
    ws();
    const c = text[i];
    if (c === '{') {
      i++;
      ws();
      const keys = new Set<string>();
      if (text[i] === '}') {
        i++;
        return;
      }
      for (;;) {
        ws();
        if (text[i] !== '"') fail('a key in double quotes expected');
        const at = i;
        const k = str();
        if (keys.has(k))
          throw bad(
            '(document)',
            `each key at most once in an object (key ${JSON.stringify(k.length > 40 ? `${k.slice(0, 37)}...` : k)} repeats at ${where(at)})`,
          );
        keys.add(k);
        ws();
        if (text[i++] !== ':') fail('":" expected');
        value(depth + 1);
        ws();
        const d = text[i++];
        if (d === '}') return;
        if (d !== ',') fail('"," or "}" expected');
      }
    }
    if (c === '[') {
      i++;
      ws();
      if (text[i] === ']') {
        i++;
        return;
      }
      for (;;) {
        value(depth + 1);
        ws();
        const d = text[i++];
        if (d === ']') return;
        if (d !== ',') fail('"," or "]" expected');
      }
    }
    if (c === '"') {
      str();
      return;
    }
    const m = /^(-?(0|[1-9]\d*)(\.\d+)?([eE][+-]?\d+)?|true|false|null)/.exec(text.slice(i, i + 400));
    if (!m) fail('a value expected');
    i += (m as RegExpExecArray)[0].length;
  };
  value(1);
  ws();
  if (i < text.length) fail('nothing more expected');
}
