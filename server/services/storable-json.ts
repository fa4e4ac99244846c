import { AppError } from '../errors.js';

/**
 * Deepest nesting a stored document may have. Real notebooks (vega-lite specs
 * included) stay far below; PostgreSQL's jsonb parser runs out of stack at a few
 * thousand levels and PGlite then fails in odd ways, so refuse long before that.
 */
export const MAX_JSON_DEPTH = 64;

// NUL cannot be stored in jsonb or text; an unpaired surrogate is not valid JSON for PostgreSQL.
const UNSTORABLE = /\u0000|[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/;

/**
 * Checks that a JSON value (already schema-valid) can be stored as jsonb: nesting at
 * most {@link MAX_JSON_DEPTH}, no NUL character and no unpaired surrogate in any
 * string or key. Walks without recursion, so hostile depth cannot overflow the stack.
 *
 * @throws AppError 400 `validation_failed` naming the path of the first problem.
 */
export function assertStorableJson(value: unknown, what: string): void {
  const stack: { value: unknown; path: string; depth: number }[] = [{ value, path: what, depth: 0 }];
  while (stack.length > 0) {
    const item = stack.pop()!;
    if (typeof item.value === 'string') {
      if (UNSTORABLE.test(item.value)) refuse(item.path, 'contains a NUL character or an unpaired surrogate');
      continue;
    }
    if (typeof item.value !== 'object' || item.value === null) continue;
    if (item.depth >= MAX_JSON_DEPTH) refuse(item.path, `is nested deeper than ${MAX_JSON_DEPTH} levels`);
    for (const [key, child] of Object.entries(item.value)) {
      if (UNSTORABLE.test(key)) refuse(`${item.path}.${key}`, 'has a key with a NUL character or an unpaired surrogate');
      stack.push({ value: child, path: `${item.path}.${key}`, depth: item.depth + 1 });
    }
  }
}

function refuse(path: string, problem: string): never {
  const shown = path.length > 120 ? `${path.slice(0, 120)}…` : path;
  throw new AppError(400, 'validation_failed', `Invalid request: ${shown} ${problem}.`, { fields: [{ path: shown, message: problem }] });
}
