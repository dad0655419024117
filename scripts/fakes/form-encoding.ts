// Parses the bracket-notation form bodies (and query strings) the card-payment SDK sends,
// e.g. `line_items[0][price_data][currency]=gbp&expand[]=x`. Edit only if a new shape appears.

export type FormValue = string | FormValue[] | { [key: string]: FormValue };
export type FormObject = { [key: string]: FormValue };

// Keys that would let a crafted body reach Object.prototype.
const FORBIDDEN_KEYS = new Set(['__proto__', 'prototype', 'constructor']);
// Caller-chosen keys: `metadata[0]=x` is a key named "0", never an array.
const FREE_FORM_KEYS = new Set(['metadata']);
const MAX_DEPTH = 12;

type Tree = Map<string, Tree | string>;

function decode(part: string): string {
  const spaced = part.replace(/\+/g, ' ');
  try {
    return decodeURIComponent(spaced);
  } catch {
    // A stray `%` should not fail the whole request.
    return spaced;
  }
}

/** Splits `a[b][0][]` into ['a', 'b', '0', '']; returns null for keys that are not well formed. */
export function splitKey(key: string): string[] | null {
  const open = key.indexOf('[');
  if (open === -1) return key === '' ? null : [key];
  const head = key.slice(0, open);
  if (head === '') return null;
  const segments = [head];
  let rest = key.slice(open);
  while (rest.length > 0) {
    const match = /^\[([^[\]]*)\]/.exec(rest);
    if (!match) return null;
    segments.push(match[1]);
    rest = rest.slice(match[0].length);
  }
  return segments;
}

function nextIndex(node: Tree): number {
  let next = 0;
  for (const key of node.keys()) if (/^\d+$/.test(key)) next = Math.max(next, Number(key) + 1);
  return next;
}

function insert(root: Tree, segments: string[], value: string): void {
  let node = root;
  for (let i = 0; i < segments.length; i++) {
    let segment = segments[i];
    // `[]` appends: give it the next free numeric slot.
    if (segment === '') segment = String(nextIndex(node));
    const last = i === segments.length - 1;
    if (last) {
      node.set(segment, value);
      return;
    }
    let child = node.get(segment);
    if (typeof child !== 'object') {
      // A scalar later used as a container is replaced: the deeper, more specific key wins.
      child = new Map();
      node.set(segment, child);
    }
    node = child;
  }
}

function toObject(node: Tree): FormObject {
  const out: FormObject = {};
  for (const [key, child] of node) out[key] = toValue(child, FREE_FORM_KEYS.has(key));
  return out;
}

function toValue(node: Tree | string, freeForm: boolean): FormValue {
  if (typeof node === 'string') return node;
  const keys = [...node.keys()];
  const isArray = !freeForm && keys.length > 0 && keys.every((k) => /^(0|[1-9]\d*)$/.test(k));
  if (!isArray) return toObject(node);
  // Sparse indexes (a[0], a[5]) compact to a dense array, as the API does.
  return keys
    .map(Number)
    .sort((a, b) => a - b)
    .map((k) => toValue(node.get(String(k)) as Tree | string, false));
}

/** Parses an `application/x-www-form-urlencoded` string into nested objects and arrays. */
export function parseFormBody(body: string): FormObject {
  const root: Tree = new Map();
  for (const pair of body.split('&')) {
    if (pair === '') continue;
    const eq = pair.indexOf('=');
    const rawKey = eq === -1 ? pair : pair.slice(0, eq);
    const rawValue = eq === -1 ? '' : pair.slice(eq + 1);
    const segments = splitKey(decode(rawKey));
    if (!segments || segments.length > MAX_DEPTH) continue;
    if (segments.some((s) => FORBIDDEN_KEYS.has(s))) continue;
    insert(root, segments, decode(rawValue));
  }
  return toObject(root);
}
