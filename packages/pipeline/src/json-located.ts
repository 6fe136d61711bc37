/**
 * Reads a JSON document the user edits (the grade catalog, the project file) so that a fault can
 * name its line and column: strict JSON (RFC 8259: no comments, no trailing commas), parsed by
 * jsonc-parser into a tree whose nodes carry their offsets; `at(path)` gives the 1-based line and
 * column of the value at a key path (of its key where the value is missing, of the nearest
 * existing parent otherwise). A syntax error names the line and column of its first fault.
 */
import { getNodeValue, parseTree, printParseErrorCode, type Node, type ParseError } from 'jsonc-parser';

export interface JsonPosition {
  line: number;
  column: number;
}

export interface LocatedJson {
  value: unknown;
  /** position of the value at `path` (object keys and array indexes), or of its nearest parent */
  at(path: readonly (string | number)[]): JsonPosition;
}

export class JsonSyntaxError extends Error {
  constructor(
    message: string,
    readonly line: number,
    readonly column: number,
  ) {
    super(message);
  }
}

/** The parser's fault codes in words; the rest as the parser names them. */
const IN_WORDS: Record<string, string> = {
  PropertyNameExpected: 'a key in double quotes was expected here (a comma after the last entry?)',
  ValueExpected: 'a value was expected here (a comma after the last item?)',
  CommaExpected: 'a comma was expected here',
  ColonExpected: 'a colon was expected after the key',
  CloseBraceExpected: 'a closing } was expected',
  CloseBracketExpected: 'a closing ] was expected',
  InvalidSymbol: 'this is not JSON (keys and strings need double quotes)',
  InvalidCommentToken: 'comments are not allowed in JSON',
  UnexpectedEndOfString: 'a string is not closed',
  EndOfFileExpected: 'the document should end here',
};

/** 1-based line and column of a character offset. */
export function positionOf(text: string, offset: number): JsonPosition {
  let line = 1;
  let start = 0;
  for (let i = 0; i < offset && i < text.length; i++) {
    if (text.charCodeAt(i) === 10) {
      line++;
      start = i + 1;
    }
  }
  return { line, column: offset - start + 1 };
}

function child(node: Node, key: string | number): { value: Node; key: Node | null } | null {
  if (node.type === 'object' && typeof key === 'string') {
    for (const p of node.children ?? []) if (p.children?.[0]?.value === key) return { key: p.children[0], value: p.children[1] ?? p.children[0] };
    return null;
  }
  if (node.type === 'array' && typeof key === 'number') {
    const v = node.children?.[key];
    return v ? { key: null, value: v } : null;
  }
  return null;
}

/** Parses `text`; throws JsonSyntaxError at the first fault. */
export function parseLocatedJson(text: string): LocatedJson {
  const errors: ParseError[] = [];
  const root = parseTree(text, errors, { disallowComments: true, allowTrailingComma: false, allowEmptyContent: false });
  if (errors.length > 0 || !root) {
    const e = errors[0];
    const where = positionOf(text, e?.offset ?? 0);
    throw new JsonSyntaxError(`invalid JSON: ${e ? (IN_WORDS[printParseErrorCode(e.error)] ?? printParseErrorCode(e.error)) : 'empty document'}`, where.line, where.column);
  }
  return {
    value: getNodeValue(root),
    at(path) {
      let node = root;
      for (let i = 0; i < path.length; i++) {
        const next = child(node, path[i]);
        if (!next) return positionOf(text, node.offset);
        // the last step points at the key, where the user reads the name
        if (i === path.length - 1 && next.key) return positionOf(text, next.key.offset);
        node = next.value;
      }
      return positionOf(text, node.offset);
    },
  };
}
