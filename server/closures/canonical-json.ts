/**
 * JSON with object keys sorted, so a value read back from jsonb (which reorders keys) compares
 * equal to the same value computed in memory. Numbers survive the jsonb round trip exactly
 * (shortest round-trip decimal in, the same digits out).
 */
export function canonicalJson(v: unknown): string {
  return JSON.stringify(sortKeys(v));
}

function sortKeys(v: unknown): unknown {
  if (Array.isArray(v)) return v.map(sortKeys);
  if (v && typeof v === 'object') {
    const o = v as Record<string, unknown>;
    const out: Record<string, unknown> = {};
    for (const k of Object.keys(o).sort()) if (o[k] !== undefined) out[k] = sortKeys(o[k]);
    return out;
  }
  return typeof v === 'number' && !Number.isFinite(v) ? null : v;
}
