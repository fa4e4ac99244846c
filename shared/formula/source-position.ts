/** 1-based line and column of a character offset in a source text. */
export interface SourcePosition {
  line: number;
  column: number;
}

/**
 * Line and column (both 1-based, as an editor shows them) of the 0-based `offset`.
 *
 * @example positionAt('a = 1\nb = ?', 10) // { line: 2, column: 5 }
 */
export function positionAt(source: string, offset: number): SourcePosition {
  const before = source.slice(0, Math.max(0, Math.min(offset, source.length)));
  const lines = before.split('\n');
  return { line: lines.length, column: lines[lines.length - 1]!.length + 1 };
}

/**
 * Where the name `name` first appears as a whole word outside strings and not after a
 * dot (so `aligned.power` does not count as a use of `power`). The parser keeps no
 * positions, so messages about a name point here. With `field`, only uses after a dot
 * count (`aligned.power` is a use of the field `power`). Undefined when it does not appear.
 *
 * @example findName('x = 1\ny = foo + 2', 'foo') // { line: 2, column: 5 }
 */
export function findName(source: string, name: string, options: { field?: boolean } = {}): SourcePosition | undefined {
  const token = /"(?:[^"\\]|\\.)*"|'(?:[^'\\]|\\.)*'|#[^\n]*|[A-Za-z_][A-Za-z0-9_]*/g;
  for (let m = token.exec(source); m !== null; m = token.exec(source)) {
    if (m[0] !== name) continue;
    const afterDot = source.slice(0, m.index).trimEnd().endsWith('.');
    if (afterDot !== (options.field === true)) continue;
    return positionAt(source, m.index);
  }
  return undefined;
}
