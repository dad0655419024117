// Differences between two versions of a code profile, for the office's version comparison.
// Rules are matched by metric and scope, which is how an office reads them ("boiler, natural gas ratio").
import type { LimitRule, Metric, RuleScope } from './types';

export type RuleChangeKind = 'added' | 'removed' | 'changed' | 'unchanged';

export interface RuleComparison {
  kind: RuleChangeKind;
  metric: Metric;
  scope: RuleScope;
  before: LimitRule | null;
  after: LimitRule | null;
  /** Fields that differ, for 'changed'. */
  fields: Array<'comparator' | 'serviceAt' | 'dangerAt' | 'source' | 'note'>;
}

function targetKey(rule: LimitRule): string {
  return [rule.metric, rule.scope.category ?? '*', rule.scope.fuel ?? '*', rule.scope.testPoint ?? '*'].join('|');
}

/** Pairs rules with the same target in order (a profile may list two for one target), then diffs each pair. */
export function compareRuleSets(before: readonly LimitRule[], after: readonly LimitRule[]): RuleComparison[] {
  const remaining = [...after];
  const result: RuleComparison[] = [];
  for (const old of before) {
    const index = remaining.findIndex((r) => targetKey(r) === targetKey(old));
    if (index === -1) {
      result.push({ kind: 'removed', metric: old.metric, scope: old.scope, before: old, after: null, fields: [] });
      continue;
    }
    const next = remaining.splice(index, 1)[0]!;
    const fields = (['comparator', 'serviceAt', 'dangerAt', 'source', 'note'] as const).filter((f) => (old[f] ?? null) !== (next[f] ?? null));
    result.push({ kind: fields.length ? 'changed' : 'unchanged', metric: old.metric, scope: old.scope, before: old, after: next, fields: [...fields] });
  }
  for (const added of remaining) result.push({ kind: 'added', metric: added.metric, scope: added.scope, before: null, after: added, fields: [] });
  return result;
}
