/** A JSON type as JSON Schema names it. */
type JsonType = 'object' | 'array' | 'string' | 'number' | 'integer' | 'boolean' | 'null';

/**
 * The part of JSON Schema (draft 2020-12) that zod's `z.toJSONSchema` writes for plain data
 * schemas: objects, records, arrays, tuples, enums, literals, unions and nullables.
 */
export interface JsonSchema {
  type?: JsonType | JsonType[];
  properties?: Record<string, JsonSchema>;
  required?: string[];
  additionalProperties?: boolean | JsonSchema;
  propertyNames?: JsonSchema;
  items?: boolean | JsonSchema;
  prefixItems?: JsonSchema[];
  minItems?: number;
  maxItems?: number;
  enum?: unknown[];
  const?: unknown;
  anyOf?: JsonSchema[];
}

/** Keywords that only describe. Any keyword neither here nor in {@link JsonSchema} is refused, not ignored. */
const NOTES = new Set(['$schema', 'title', 'description']);
const KNOWN = new Set(['type', 'properties', 'required', 'additionalProperties', 'propertyNames', 'items', 'prefixItems', 'minItems', 'maxItems', 'enum', 'const', 'anyOf']);

class Mismatch extends Error {}

/**
 * Checks a value against a JSON Schema made from a zod schema, with zod's rules: numbers must be
 * finite, a required key must be there and not undefined, and keys an object schema does not name
 * are left out of the result (as zod's parse leaves them out) rather than refused. Returns the
 * checked copy; throws an Error naming the first path that does not match. Lets a command check
 * one document without loading zod (its start-up costs more than the check).
 *
 * @example checkJson({ type: 'object', properties: { n: { type: 'number' } }, required: ['n'] }, { n: 1, x: 2 }) // { n: 1 }
 */
export function checkJson(schema: JsonSchema, value: unknown): unknown {
  try {
    return check(schema, value, '');
  } catch (error) {
    if (error instanceof Mismatch) throw new Error(error.message);
    throw error;
  }
}

function check(schema: JsonSchema, value: unknown, path: string): unknown {
  for (const key of Object.keys(schema)) {
    if (!KNOWN.has(key) && !NOTES.has(key)) throw new Error(`checkJson: the schema uses "${key}" (at ${where(path)}), which this checker does not know`);
  }
  if (schema.anyOf) {
    for (const option of schema.anyOf) {
      try {
        return check(option, value, path);
      } catch (error) {
        if (!(error instanceof Mismatch)) throw error;
      }
    }
    throw mismatch(path, 'none of its allowed forms', value);
  }
  if ('const' in schema && value !== schema.const) throw mismatch(path, JSON.stringify(schema.const), value);
  if (schema.enum && !schema.enum.includes(value)) throw mismatch(path, `one of ${schema.enum.map((e) => JSON.stringify(e)).join(', ')}`, value);
  const types = schema.type === undefined ? [] : Array.isArray(schema.type) ? schema.type : [schema.type];
  const type = types.find((t) => isType(t, value));
  if (types.length > 0 && type === undefined) throw mismatch(path, types.map((t) => (t === 'number' ? 'finite number' : t)).join(' or '), value);
  if (Array.isArray(value)) return checkArray(schema, value, path);
  if (value !== null && typeof value === 'object') return checkObject(schema, value as Record<string, unknown>, path);
  return value;
}

function checkObject(schema: JsonSchema, value: Record<string, unknown>, path: string): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const key of schema.required ?? []) {
    if (value[key] === undefined) throw new Mismatch(`${where(join(path, key))}: missing`);
  }
  const named = schema.properties ?? {};
  for (const [key, property] of Object.entries(named)) {
    if (value[key] !== undefined) out[key] = check(property, value[key], join(path, key));
  }
  const rest = schema.additionalProperties;
  if (typeof rest === 'object' || schema.propertyNames) {
    for (const key of Object.keys(value)) {
      if (Object.hasOwn(named, key)) continue;
      if (schema.propertyNames) check(schema.propertyNames, key, join(path, key));
      out[key] = typeof rest === 'object' ? check(rest, value[key], join(path, key)) : value[key];
    }
  }
  return out;
}

function checkArray(schema: JsonSchema, value: unknown[], path: string): unknown[] {
  if (schema.minItems !== undefined && value.length < schema.minItems) throw mismatch(path, `at least ${schema.minItems} items`, value);
  if (schema.maxItems !== undefined && value.length > schema.maxItems) throw mismatch(path, `at most ${schema.maxItems} items`, value);
  const first = schema.prefixItems ?? [];
  if (schema.items === false && value.length > first.length) throw mismatch(path, `at most ${first.length} items`, value);
  // A loop, not map: map skips the holes of a sparse array, which zod reads as undefined items.
  const out: unknown[] = [];
  for (let i = 0; i < value.length; i++) {
    const itemSchema = i < first.length ? first[i] : typeof schema.items === 'object' ? schema.items : undefined;
    out.push(itemSchema ? check(itemSchema, value[i], join(path, String(i))) : value[i]);
  }
  return out;
}

function isType(type: JsonType, value: unknown): boolean {
  switch (type) {
    case 'null':
      return value === null;
    case 'array':
      return Array.isArray(value);
    case 'object':
      return value !== null && typeof value === 'object' && !Array.isArray(value);
    case 'number':
      return typeof value === 'number' && Number.isFinite(value);
    case 'integer':
      return Number.isSafeInteger(value);
    default:
      return typeof value === type;
  }
}

const join = (path: string, key: string): string => (path === '' ? key : `${path}.${key}`);
const where = (path: string): string => (path === '' ? 'the top level' : path);

function mismatch(path: string, expected: string, value: unknown): Mismatch {
  const got = typeof value === 'number' || value === undefined ? String(value) : value === null ? 'null' : Array.isArray(value) ? `an array of ${value.length}` : typeof value === 'object' ? 'an object' : JSON.stringify(value).slice(0, 40);
  return new Mismatch(`${where(path)}: expected ${expected}, got ${got}`);
}
