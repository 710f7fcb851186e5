/**
 * The schema of summary.json (`summary.schema.json`, JSON Schema 2020-12) and a small
 * validator for the subset of JSON Schema it uses.
 *
 * @module
 */
import schemaJson from "./summary.schema.json" with { type: "json" };

/** The JSON Schema of summary.json. */
export const SUMMARY_SCHEMA: JsonSchema = schemaJson as JsonSchema;

/** The subset of JSON Schema that {@linkcode validateJson} understands. */
export interface JsonSchema {
  /** A JSON type or a list of them ("integer" is a whole number). */
  type?: string | string[];
  /** Allowed values. */
  enum?: unknown[];
  /** The only allowed value. */
  const?: unknown;
  /** Schemas of named properties. */
  properties?: Record<string, JsonSchema>;
  /** Properties that must be present. */
  required?: string[];
  /** Schema of other properties, or false to forbid them. */
  additionalProperties?: boolean | JsonSchema;
  /** Schema of every array item. */
  items?: JsonSchema;
  /** Fewest array items. */
  minItems?: number;
  /** Most array items. */
  maxItems?: number;
  /** Smallest number. */
  minimum?: number;
  /** Largest number. */
  maximum?: number;
  /** A regular expression strings must match. */
  pattern?: string;
  /** Any one of these (at least one) must match. */
  anyOf?: JsonSchema[];
  /** A reference `#/$defs/name`. */
  $ref?: string;
  /** Named sub-schemas. */
  $defs?: Record<string, JsonSchema>;
  /** Other keywords (documentation) are ignored. */
  [keyword: string]: unknown;
}

function typeOf(x: unknown): string {
  if (x === null) return "null";
  if (Array.isArray(x)) return "array";
  return typeof x;
}

function matchesType(x: unknown, t: string): boolean {
  if (t === "integer") return typeof x === "number" && Number.isInteger(x);
  return typeOf(x) === t;
}

/**
 * Validate a JSON value against a schema (type, enum, const, properties, required,
 * additionalProperties, items, minItems, maxItems, minimum, maximum, pattern, anyOf and
 * local `$ref`s). Returns the problems as `path: message` lines; empty means valid.
 *
 * @example
 * ```ts
 * import { validateJson } from "./schema.ts";
 * import assert from "node:assert/strict";
 * const schema = { type: "object", required: ["a"], properties: { a: { type: "integer", minimum: 0 } }, additionalProperties: false };
 * assert.deepEqual(validateJson({ a: 1 }, schema), []);
 * assert.deepEqual(validateJson({ a: -1, b: 2 }, schema), ["$.a: -1 < minimum 0", '$: unexpected property "b"']);
 * ```
 */
export function validateJson(
  value: unknown,
  schema: JsonSchema,
  root: JsonSchema = schema,
): string[] {
  const errors: string[] = [];
  walk(value, schema, "$", root, errors);
  return errors;
}

function resolve(s: JsonSchema, root: JsonSchema): JsonSchema {
  if (!s.$ref) return s;
  const m = /^#\/\$defs\/(.+)$/.exec(s.$ref);
  const target = m ? root.$defs?.[m[1]] : undefined;
  if (!target) throw new Error(`unresolved $ref ${s.$ref}`);
  return resolve(target, root);
}

function walk(x: unknown, s0: JsonSchema, path: string, root: JsonSchema, errors: string[]): void {
  const s = resolve(s0, root);
  if (s.anyOf) {
    const ok = s.anyOf.some((alt) => validateJson(x, alt, root).length === 0);
    if (!ok) errors.push(`${path}: matches none of the ${s.anyOf.length} alternatives`);
    return;
  }
  if (s.type !== undefined) {
    const types = Array.isArray(s.type) ? s.type : [s.type];
    if (!types.some((t) => matchesType(x, t))) {
      errors.push(`${path}: expected ${types.join(" or ")}, got ${typeOf(x)}`);
      return;
    }
  }
  if (s.const !== undefined && JSON.stringify(x) !== JSON.stringify(s.const)) {
    errors.push(`${path}: expected ${JSON.stringify(s.const)}`);
  }
  if (s.enum && !s.enum.some((v) => JSON.stringify(v) === JSON.stringify(x))) {
    errors.push(`${path}: ${JSON.stringify(x)} is not one of ${JSON.stringify(s.enum)}`);
  }
  if (typeof x === "number") {
    if (s.minimum !== undefined && x < s.minimum) {
      errors.push(`${path}: ${x} < minimum ${s.minimum}`);
    }
    if (s.maximum !== undefined && x > s.maximum) {
      errors.push(`${path}: ${x} > maximum ${s.maximum}`);
    }
  }
  if (typeof x === "string" && s.pattern && !new RegExp(s.pattern).test(x)) {
    errors.push(`${path}: "${x}" does not match ${s.pattern}`);
  }
  if (Array.isArray(x)) {
    if (s.minItems !== undefined && x.length < s.minItems) {
      errors.push(`${path}: fewer than ${s.minItems} items`);
    }
    if (s.maxItems !== undefined && x.length > s.maxItems) {
      errors.push(`${path}: more than ${s.maxItems} items`);
    }
    if (s.items) x.forEach((v, i) => walk(v, s.items!, `${path}[${i}]`, root, errors));
  }
  if (x !== null && typeof x === "object" && !Array.isArray(x)) {
    const o = x as Record<string, unknown>;
    for (const k of s.required ?? []) if (!(k in o)) errors.push(`${path}: missing "${k}"`);
    for (const [k, v] of Object.entries(o)) {
      const p = s.properties?.[k];
      if (p) walk(v, p, `${path}.${k}`, root, errors);
      else if (s.additionalProperties === false) errors.push(`${path}: unexpected property "${k}"`);
      else if (typeof s.additionalProperties === "object") {
        walk(v, s.additionalProperties, `${path}.${k}`, root, errors);
      }
    }
  }
}
