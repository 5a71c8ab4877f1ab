/**
 * Gives every field of the objects `make` builds V8's most general kind at once, before any real
 * object is built. V8 stores a field the way its first values allow (a small integer, then a
 * double, then anything); a later value of another kind (a layer's weight 1 then 0.48, its held
 * gain null then a number, a wander's σ 1 then 0.3) gives the objects built after it a new shape,
 * and code compiled for the earlier one deoptimises when it meets them (2–3 times a run in the
 * layer model's hot functions). An integer and then null in every field leave each field
 * general, so the objects `make` builds all have one shape. Call once, where `make` is defined.
 */
export function oneShapeFrom<T>(make: (f: T) => T, fields: readonly (keyof T)[]): void {
  for (const v of [0, null]) make(Object.fromEntries(fields.map((k) => [k, v])) as T);
}
