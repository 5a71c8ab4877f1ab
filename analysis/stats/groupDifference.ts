import { fUpperP, studentTTwoSidedP } from './distributions';
import { type GroupSummary } from './groupSummary';

export type GroupDifference =
  | {
      test: 'welch-t' | 'welch-anova';
      /** t for two groups, F for more. */
      statistic: number;
      df1: number;
      df2: number;
      /** Probability of a difference at least this large between groups that really share one mean. */
      pValue: number;
      /** Groups that entered the test (two or more values each). */
      groups: number;
      source: string;
    }
  | { test: null; groups: number; reason: string };

export const WELCH_T_SOURCE = "Welch's t-test (unequal variances): B. L. Welch, Biometrika 34, 28–35 (1947); NIST/SEMATECH e-Handbook of Statistical Methods §1.3.5.3";
export const WELCH_ANOVA_SOURCE = "Welch's one-way ANOVA (unequal variances): B. L. Welch, Biometrika 38, 330–336 (1951)";

/**
 * Whether the group means differ by more than chance: Welch's t-test for two groups, Welch's
 * one-way ANOVA for more. Both allow each group its own variance (shifts and chambers need not
 * scatter alike). Groups with fewer than two values are left out; a group whose values are all
 * equal leaves the test undefined.
 */
export function groupDifference(all: readonly GroupSummary[]): GroupDifference {
  const groups = all.filter((g) => g.count >= 2);
  if (groups.length < 2) return { test: null, groups: groups.length, reason: 'fewer than two groups with two or more values' };
  if (groups.some((g) => !(g.sd > 0))) return { test: null, groups: groups.length, reason: 'a group has no scatter (all its values equal)' };
  if (groups.length === 2) return welchT(groups[0], groups[1]);
  return welchAnova(groups);
}

/** t = (x̄₁ − x̄₂)/√(s₁²/n₁ + s₂²/n₂), ν by the Welch–Satterthwaite formula. */
export function welchT(a: GroupSummary, b: GroupSummary): GroupDifference {
  const va = (a.sd * a.sd) / a.count;
  const vb = (b.sd * b.sd) / b.count;
  const t = (a.mean - b.mean) / Math.sqrt(va + vb);
  const dof = (va + vb) ** 2 / ((va * va) / (a.count - 1) + (vb * vb) / (b.count - 1));
  return { test: 'welch-t', statistic: t, df1: 1, df2: dof, pValue: studentTTwoSidedP(t, dof), groups: 2, source: WELCH_T_SOURCE };
}

/**
 * Welch (1951): weights wᵢ = nᵢ/sᵢ², weighted mean x̄′; F = [Σwᵢ(x̄ᵢ − x̄′)²/(k − 1)] /
 * [1 + 2(k − 2)Λ/(k² − 1)], Λ = Σ(1 − wᵢ/W)²/(nᵢ − 1), with (k − 1, (k² − 1)/(3Λ)) degrees of freedom.
 */
export function welchAnova(groups: readonly GroupSummary[]): GroupDifference {
  const k = groups.length;
  const w = groups.map((g) => g.count / (g.sd * g.sd));
  const sumW = w.reduce((s, x) => s + x, 0);
  const mean = groups.reduce((s, g, i) => s + w[i] * g.mean, 0) / sumW;
  const between = groups.reduce((s, g, i) => s + w[i] * (g.mean - mean) ** 2, 0) / (k - 1);
  const lambda = groups.reduce((s, g, i) => s + (1 - w[i] / sumW) ** 2 / (g.count - 1), 0);
  const f = between / (1 + (2 * (k - 2) * lambda) / (k * k - 1));
  const df2 = (k * k - 1) / (3 * lambda);
  return { test: 'welch-anova', statistic: f, df1: k - 1, df2, pValue: fUpperP(f, k - 1, df2), groups: k, source: WELCH_ANOVA_SOURCE };
}
