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
  // The path is kept as a stack and spelled out only for an error: building it for every node
  // made large studies several times slower to hash.
  const path: (string | number)[] = [];
  const fault = (what: string) => new TypeError(`${spell(path)}: ${what}`);

  function write(node: unknown): string {
    if (node === null) return 'null';
    switch (typeof node) {
      case 'boolean':
        return node ? 'true' : 'false';
      case 'string':
        return quote(node);
      case 'number':
        if (!Number.isFinite(node)) throw fault(`${node} has no JSON form`);
        // -0 prints as 0 under ECMAScript Number-to-String, which RFC 8785 adopts.
        return JSON.stringify(node);
      case 'object':
        return Array.isArray(node) ? writeArray(node) : writeObject(node as Record<string, unknown>);
      default:
        throw fault(`a ${typeof node} has no JSON form`);
    }
  }

  function writeArray(items: unknown[]): string {
    let text = '[';
    for (let i = 0; i < items.length; i++) {
      path.push(i);
      text += (i > 0 ? ',' : '') + write(items[i]);
      path.pop();
    }
    return `${text}]`;
  }

  function writeObject(object: Record<string, unknown>): string {
    const prototype = Object.getPrototypeOf(object);
    if (prototype !== Object.prototype && prototype !== null)
      throw fault('only plain objects have a canonical form');
    // Array.prototype.sort without a comparator compares UTF-16 code units, as RFC 8785 §3.2.3 asks.
    const keys = Object.keys(object).sort();
    const flat = flatCopy(object, keys);
    if (flat !== null) return JSON.stringify(flat);
    let text = '{';
    let first = true;
    for (const key of keys) {
      const member = object[key];
      if (member === undefined) continue;
      path.push(key);
      text += `${first ? '' : ','}${quote(key)}:${write(member)}`;
      path.pop();
      first = false;
    }
    return `${text}}`;
  }

  return write(value);
}

/**
 * The fast path for the common leaf object (every member a string, boolean, null or finite
 * number): a copy with its members inserted in sorted order, which JSON.stringify then writes
 * exactly as RFC 8785 does. Not taken when a key looks like an array index, since JavaScript
 * enumerates those first whatever the insertion order.
 */
function flatCopy(object: Record<string, unknown>, sortedKeys: string[]): Record<string, unknown> | null {
  const copy: Record<string, unknown> = {};
  for (const key of sortedKeys) {
    const member = object[key];
    const kind = typeof member;
    if (
      kind === 'object'
        ? member !== null
        : kind === 'number'
          ? !Number.isFinite(member)
          : kind !== 'string' && kind !== 'boolean' && kind !== 'undefined'
    ) {
      return null;
    }
    // An index-like key, and "__proto__", whose assignment would set the copy's prototype rather
    // than add a member (the member would vanish from the text), take the general path.
    if (indexLike.test(key) || key === '__proto__') return null;
    copy[key] = member;
  }
  return copy;
}

const indexLike = /^(?:0|[1-9][0-9]*)$/;

/** Strings that need no escape (the common case) skip JSON.stringify; its escaping is RFC 8785's. */
// eslint-disable-next-line no-control-regex -- control characters are exactly what must be escaped
const needsEscape = /["\\\u0000-\u001f\ud800-\udfff]/;
const quote = (text: string): string => (needsEscape.test(text) ? JSON.stringify(text) : `"${text}"`);

function spell(path: readonly (string | number)[]): string {
  return path.reduce<string>(
    (text, part) => (typeof part === 'number' ? `${text}[${part}]` : `${text}.${part}`),
    '$',
  );
}

/** The canonical form as UTF-8 bytes, ready to hash or sign. */
export function canonicalBytes(value: unknown): Uint8Array {
  return utf8ToBytes(canonicalJson(value));
}
