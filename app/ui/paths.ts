/** Reading and writing plain JSON data by house paths such as `sites[2].lat`. */

type Json = Record<string, unknown> | unknown[];

/** The keys of a path: `sites[2].lat` → ['sites', 2, 'lat']. */
export function pathKeys(path: string): (string | number)[] {
  return (path.match(/[^.[\]]+/g) ?? []).map((k) => (/^\d+$/.test(k) ? Number(k) : k));
}

/** Value at path, or undefined when any step is missing. */
export function getAt(data: unknown, path: string): unknown {
  let node: unknown = data;
  for (const k of pathKeys(path)) {
    if (node === null || typeof node !== 'object') return undefined;
    node = (node as Record<string | number, unknown>)[k];
  }
  return node;
}

/**
 * A copy of data with path set to value (objects and arrays created on the way); undefined
 * deletes an object key. The input is not changed.
 */
export function setAt<T>(data: T, path: string, value: unknown): T {
  const keys = pathKeys(path);
  const root = structuredClone(data) as unknown as Json;
  let node: Json = root;
  keys.forEach((k, i) => {
    const rec = node as Record<string | number, unknown>;
    if (i === keys.length - 1) {
      if (value === undefined && !Array.isArray(node)) delete rec[k];
      else rec[k] = value;
      return;
    }
    const next = rec[k];
    if (next === null || typeof next !== 'object') {
      rec[k] = typeof keys[i + 1] === 'number' ? [] : {};
    }
    node = rec[k] as Json;
  });
  return root as unknown as T;
}
