import { describe, expect, it } from 'vitest';
import { parseDesign } from '../parseDesign';
import { quarterWaveAr, singleLayerRule } from '../singleLayerRule';

const mgf2OnGlass = (layers: unknown[]) =>
  parseDesign({
    format: 'fringelog.design/1',
    name: 'one MgF2 quarter-wave',
    referenceWavelengthNm: 550,
    substrate: { model: 'constant', n: 1.52 },
    materials: { L: { model: 'constant', n: 1.38 }, H: { model: 'constant', n: 2.1 } },
    layers,
  });
const monitor = { wavelengthNm: 550, mode: 'T', chip: 1, cut: 'turning-point' };

describe('the single quarter-wave AR layer', () => {
  it('matches the published worked value for MgF2 (1.38) on glass (1.52) at 550 nm', () => {
    const r = quarterWaveAr(1, 1.52, 1.38, 550);
    // Macleod, Thin-Film Optical Filters, ch. "Antireflection coatings": a quarter-wave of
    // MgF2 (1.38) on glass (1.52) leaves R ≈ 1.26 % (value as recalled: from memory); the
    // ideal index √1.52 ≈ 1.23 is given there too.
    expect(r.residualR * 100).toBeCloseTo(1.26, 2);
    expect(r.idealIndex).toBeCloseTo(1.2329, 4);
    // λ/(4n) = 550/(4·1.38) = 99.64 nm (Hecht, Optics, thin-film quarter-wave condition).
    expect(r.quarterWaveNm).toBeCloseTo(99.64, 2);
    // Uncoated glass 1.52: Fresnel normal-incidence R = (0.52/2.52)² ≈ 4.26 % (Hecht, Optics, Fresnel equations).
    expect(r.bareR * 100).toBeCloseTo(4.26, 2);
  });

  it('is zero at the ideal index and refuses nonsense', () => {
    expect(quarterWaveAr(1, 1.52, Math.sqrt(1.52), 550).residualR).toBeLessThan(1e-15);
    expect(() => quarterWaveAr(1, -1.52, 1.38, 550)).toThrow('ns must be a finite number > 0 (got -1.52)');
  });

  it("agrees with the characteristic-matrix response of the design's own quarter-wave layer", () => {
    const rule = singleLayerRule(mgf2OnGlass([{ material: 'L', qwot: 1, monitor }]));
    expect(rule).not.toBeNull();
    expect(rule!.lowMaterial).toBe('L');
    expect(rule!.designRAtRef).toBeCloseTo(rule!.residualR, 10);
    expect(rule!.band).toMatchObject({ fromNm: 440, toNm: 688 });
    expect(rule!.band.maxR).toBeGreaterThanOrEqual(rule!.designRAtRef);
    expect(rule!.band.maxR).toBeLessThan(rule!.bareR);
  });

  it("summarises the band only where every material has an index (a table measured over 500–700 nm)", () => {
    const d = parseDesign({
      format: 'fringelog.design/1', name: 'narrow table', referenceWavelengthNm: 550, substrate: { model: 'constant', n: 1.52 }, substrateBackside: true,
      materials: { L: { model: 'table', points: [[500, 1.38, 0], [700, 1.38, 0]] } }, layers: [{ material: 'L', qwot: 1, monitor }],
    });
    const rule = singleLayerRule(d)!;
    // 0.8·550 = 440 nm lies outside the table: the band starts where it does
    expect(rule.band).toMatchObject({ fromNm: 500, toNm: 688 });
    expect(rule.designRAtRef).toBeCloseTo(rule.residualR, 10);
  });

  it('picks the lowest-index material of a multilayer, and has nothing to say without layers', () => {
    const rule = singleLayerRule(mgf2OnGlass([{ material: 'H', qwot: 1, monitor }, { material: 'L', qwot: 1, monitor }]));
    expect(rule!.lowMaterial).toBe('L');
    expect(rule!.lowIndex).toBe(1.38);
    expect(singleLayerRule(mgf2OnGlass([]))).toBeNull();
  });
});
