/**
 * Every key path a zod schema accepts, for the documentation tests: objects give `a.b`, arrays of objects `a[].b`,
 * records `a.*.b`; optional, default, nullable and refined wrappers are looked through. Zod 4 definitions (`_zod.def`).
 */
type AnySchema = { _zod: { def: Record<string, any> } };

/** Dotted key paths of a schema, depth first, in declaration order. */
export function schemaKeyPaths(schema: AnySchema, prefix = ''): string[] {
  const def = schema._zod.def;
  switch (def.type) {
    case 'optional':
    case 'nullable':
    case 'default':
    case 'prefault':
    case 'readonly':
    case 'nonoptional':
      return schemaKeyPaths(def.innerType, prefix);
    case 'pipe':
      return schemaKeyPaths(def.in, prefix);
    case 'array':
      return schemaKeyPaths(def.element, `${prefix}[]`);
    case 'record':
      return schemaKeyPaths(def.valueType, `${prefix}.*`);
    case 'object': {
      const out: string[] = [];
      for (const [k, v] of Object.entries(def.shape as Record<string, AnySchema>)) {
        const path = prefix ? `${prefix}.${k}` : k;
        out.push(path, ...schemaKeyPaths(v, path));
      }
      return out;
    }
    default:
      return [];
  }
}

/** Key paths present in a JSON value, with the same notation (arrays of objects `a[].b`; `recordKeys` become `*`). */
export function jsonKeyPaths(value: unknown, prefix = '', recordKeys: readonly string[] = []): string[] {
  if (Array.isArray(value)) return [...new Set(value.flatMap((v) => jsonKeyPaths(v, `${prefix}[]`, recordKeys)))];
  if (value === null || typeof value !== 'object') return [];
  const out: string[] = [];
  for (const [k, v] of Object.entries(value)) {
    const path = recordKeys.includes(prefix) ? `${prefix}.*` : prefix ? `${prefix}.${k}` : k;
    out.push(path, ...jsonKeyPaths(v, path, recordKeys));
  }
  return [...new Set(out)];
}
