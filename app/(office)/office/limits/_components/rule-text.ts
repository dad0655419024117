// How the limits screens write a rule's scope and thresholds in words.
import {
  APPLIANCE_CATEGORY_LABELS,
  FUEL_LABELS,
  METRIC_UNITS,
  TEST_POINT_LABELS,
  type Comparator,
  type Metric,
  type RuleScope,
} from '@/lib/limits';

export function scopeText(scope: RuleScope): string {
  return [
    scope.category ? APPLIANCE_CATEGORY_LABELS[scope.category] : 'Any appliance',
    scope.fuel ? FUEL_LABELS[scope.fuel] : 'any fuel',
    scope.testPoint ? TEST_POINT_LABELS[scope.testPoint] : 'any test point',
  ].join(' · ');
}

export function thresholdText(metric: Metric, comparator: Comparator, value: number | null): string {
  if (value === null) return '—';
  if (metric === 'spillage') return 'a failed test';
  const unit = METRIC_UNITS[metric];
  return `${comparator === 'gt' ? 'above' : 'at or above'} ${value}${unit ? ` ${unit}` : ''}`;
}
