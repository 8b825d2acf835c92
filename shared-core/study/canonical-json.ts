import { utf8ToBytes } from '@noble/hashes/utils.js';

/**
 * RFC 8785 JSON Canonicalization Scheme (JCS): the one byte form that every host hashes and signs.
 *
 *   objects: members sorted by key, compared as UTF-16 code units; no whitespace
 *   numbers:  ECMAScript Number-to-String (what JSON.stringify prints); NaN and ±Infinity refused
 *   strings:  JSON.stringify escaping (RFC 8785 §3.2.2.2 is exactly ECMAScript's)
 *
 * Members whose value is undefined are left out (as JSON.stringify does); undefined elsewhere is
 * refused, so that two different documents can never canonicalize to the same text.
 *
 * Source: RFC 8785, JSON Canonicalization Scheme (2020), §3.2.
 */
export function canonicalJson(value: unknown): string {
  return write(value, '$');
}

function write(value: unknown, path: string): string {
  if (value === null) return 'null';
  switch (typeof value) {
    case 'boolean':
      return value ? 'true' : 'false';
    case 'string':
      return JSON.stringify(value);
    case 'number':
      if (!Number.isFinite(value)) throw new TypeError(`${path}: ${value} has no JSON form`);
      // -0 prints as 0 under ECMAScript Number-to-String, which RFC 8785 adopts.
      return JSON.stringify(value);
    case 'object':
      if (Array.isArray(value)) {
        return `[${value.map((item, index) => write(item, `${path}[${index}]`)).join(',')}]`;
      }
      return writeObject(value as Record<string, unknown>, path);
    default:
      throw new TypeError(`${path}: a ${typeof value} has no JSON form`);
  }
}

function writeObject(object: Record<string, unknown>, path: string): string {
  const prototype = Object.getPrototypeOf(object);
  if (prototype !== Object.prototype && prototype !== null) {
    throw new TypeError(`${path}: only plain objects have a canonical form`);
  }
  // Array.prototype.sort without a comparator compares UTF-16 code units, as RFC 8785 §3.2.3 asks.
  const keys = Object.keys(object)
    .filter((key) => object[key] !== undefined)
    .sort();
  return `{${keys.map((key) => `${JSON.stringify(key)}:${write(object[key], `${path}.${key}`)}`).join(',')}}`;
}

/** The canonical form as UTF-8 bytes, ready to hash or sign. */
export function canonicalBytes(value: unknown): Uint8Array {
  return utf8ToBytes(canonicalJson(value));
}
