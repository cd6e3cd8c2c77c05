// Looking up a name that came from outside (a sort, a filter, a field, a slot, an
// attribute, a rule) in one of our tables: only the table's own entries count, never
// what every object inherits (`__proto__`, `constructor`, `toString`, …).

export function hasOwnKey<T extends object>(table: T, key: unknown): key is keyof T & string {
  return typeof key === "string" && Object.hasOwn(table, key);
}

/** The table's own entry for `key`, or undefined. */
export function ownValue<T>(table: Readonly<Record<string, T>>, key: unknown): T | undefined {
  return typeof key === "string" && Object.hasOwn(table, key) ? table[key] : undefined;
}

/** `key` when it is one of `allowed`, else `fallback`. */
export function pick<K extends string>(allowed: readonly K[], key: unknown, fallback: K): K {
  return typeof key === "string" && (allowed as readonly string[]).includes(key)
    ? (key as K)
    : fallback;
}
