import { type core } from 'zod/mini';
import { type Complex } from '../optics/complex';
import { indexAt } from '../materials/indexAt';
import { materialLibrary } from '../materials/library';
import { materialModelSchema, type MaterialModel } from '../materials/schema';
import { DesignFormatError, formatKeyPath } from './DesignFormatError';
import { designFileSchema, type MonitorSpec, type Tolerance } from './schema';
import { layerTolerance } from './tolerance';

export interface DesignLayer {
  /** 1-based, deposition order. */
  layer: number;
  /** Key into Design.materials. */
  material: string;
  thicknessNm: number;
  /** Optical thickness in quarter-waves at the reference wavelength. */
  qwot: number;
  monitor: MonitorSpec;
  /** Limits after the design's own default and the shop's (see layerTolerance). */
  tolerance: Required<Tolerance>;
}

export interface Design {
  name: string;
  referenceWavelengthNm: number;
  ambient: MaterialModel;
  substrate: MaterialModel;
  substrateBackside: boolean;
  /** Every material the layers use, by the name the layers give (design entries, then built-ins). */
  materials: Record<string, MaterialModel>;
  layers: DesignLayer[];
}

const VACUUM: MaterialModel = { model: 'constant', n: 1, k: 0 };

function firstIssue(error: core.$ZodError, prefix: readonly PropertyKey[], fileName?: string): DesignFormatError {
  const issue = error.issues[0];
  const path = [...prefix, ...issue.path];
  if (issue.code === 'unrecognized_keys') {
    const keys = issue.keys.map((k) => `"${k}"`).join(', ');
    return new DesignFormatError(formatKeyPath(path), `unknown key${issue.keys.length > 1 ? 's' : ''} ${keys}`, fileName);
  }
  return new DesignFormatError(formatKeyPath(path), issue.message, fileName);
}

function modelAt(ref: unknown, path: PropertyKey[], fileName?: string): MaterialModel {
  if (typeof ref === 'string') {
    const hit = Object.hasOwn(materialLibrary, ref) ? materialLibrary[ref] : undefined;
    if (!hit) {
      throw new DesignFormatError(formatKeyPath(path), `unknown material "${ref}" (built-in: ${Object.keys(materialLibrary).join(', ')})`, fileName);
    }
    return hit.model;
  }
  const r = materialModelSchema.safeParse(ref);
  if (!r.success) throw firstIssue(r.error, path, fileName);
  return r.data;
}

function evaluate(model: MaterialModel, wavelengthNm: number, path: string, what: string, fileName?: string): Complex {
  try {
    return indexAt(model, wavelengthNm);
  } catch (e) {
    throw new DesignFormatError(path, `${what}: ${(e as Error).message}`, fileName);
  }
}

/**
 * Validates a parsed "fringelog.design/1" document and resolves it: material names against the
 * design's `materials` then the built-in library, QWOT ↔ thickness at the reference wavelength
 * (thicknessNm = qwot·λref/(4·n(λref)), n the real part), and every index the monitor curves need
 * evaluated once so range errors surface here, naming the key.
 * @throws DesignFormatError
 */
export function parseDesign(json: unknown, fileName?: string): Design {
  const parsed = designFileSchema.safeParse(json);
  if (!parsed.success) throw firstIssue(parsed.error, [], fileName);
  const file = parsed.data;
  const ambient = file.ambient === undefined ? VACUUM : modelAt(file.ambient, ['ambient'], fileName);
  const substrate = modelAt(file.substrate, ['substrate'], fileName);
  const substrateBackside = file.substrateBackside ?? false;

  // Null prototype: a material named "__proto__" or "constructor" is just a key.
  const materials: Record<string, MaterialModel> = Object.create(null);
  for (const [key, ref] of Object.entries(file.materials ?? {})) materials[key] = modelAt(ref, ['materials', key], fileName);

  const lambdaRef = file.referenceWavelengthNm;
  const layers: DesignLayer[] = file.layers.map((raw, i) => {
    const where = `layers[${i}]`;
    if (!Object.hasOwn(materials, raw.material)) {
      if (!Object.hasOwn(materialLibrary, raw.material)) {
        const known = [...Object.keys(materials), ...Object.keys(materialLibrary)].join(', ');
        throw new DesignFormatError(`${where}.material`, `"${raw.material}" is neither in "materials" nor built in (known: ${known})`, fileName);
      }
      materials[raw.material] = materialLibrary[raw.material].model;
    }
    const nRef = evaluate(materials[raw.material], lambdaRef, `${where}.${raw.qwot === undefined ? 'material' : 'qwot'}`, `material "${raw.material}" at referenceWavelengthNm`, fileName).re;
    const thicknessNm = raw.thicknessNm ?? (raw.qwot! * lambdaRef) / (4 * nRef);
    const qwot = raw.qwot ?? (4 * nRef * thicknessNm) / lambdaRef;
    return { layer: i + 1, material: raw.material, thicknessNm, qwot, monitor: { ...raw.monitor }, tolerance: layerTolerance(raw.tolerance, file.tolerance) };
  });

  // Every index a monitor curve will need, checked now: the chip's stack, the substrate and the ambient at the layer's monitor wavelength.
  for (const layer of layers) {
    const where = `layers[${layer.layer - 1}].monitor.wavelengthNm`;
    const wl = layer.monitor.wavelengthNm;
    const n0 = evaluate(ambient, wl, where, 'ambient', fileName);
    if (n0.im !== 0) throw new DesignFormatError('ambient', `must be non-absorbing (k = ${-n0.im} at ${wl} nm)`, fileName);
    const ns = evaluate(substrate, wl, where, 'substrate', fileName);
    if (substrateBackside && ns.im !== 0) {
      throw new DesignFormatError('substrate', `a thick substrate with substrateBackside: true must be non-absorbing (k = ${-ns.im} at ${wl} nm)`, fileName);
    }
    for (const below of layers) {
      if (below.layer > layer.layer) break;
      if (below.monitor.chip === layer.monitor.chip) evaluate(materials[below.material], wl, where, `material "${below.material}" (layer ${below.layer} on chip ${layer.monitor.chip})`, fileName);
    }
  }

  return {
    name: file.name ?? (fileName ? fileName.replace(/^.*[\\/]/, '').replace(/\.json$/i, '') : 'design'),
    referenceWavelengthNm: lambdaRef,
    ambient,
    substrate,
    substrateBackside,
    materials,
    layers,
  };
}
