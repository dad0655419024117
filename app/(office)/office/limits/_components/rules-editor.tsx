'use client';
// The rules of a profile's latest version, with add, change and remove. Every change is saved as a
// new version, so what the rules said on any earlier date is kept.
import { useState } from 'react';
import { useRouter } from 'next/navigation';
import { METRIC_LABELS } from '@/lib/limits';
import type { StoredRule } from '@/db/code-profiles';
import { fetchJson } from '@/lib/fetch-json';
import { Button } from '@/components/ui/button';
import { Alert } from '@/components/ui/alert';
import { RuleForm } from './rule-form';
import { scopeText, thresholdText } from './rule-text';

export function RulesEditor({ ownerId, rules, today }: { ownerId: string; rules: StoredRule[]; today: string }) {
  const router = useRouter();
  const [editing, setEditing] = useState<string | 'new' | null>(null);
  const [failure, setFailure] = useState('');
  const [busy, setBusy] = useState(false);

  async function remove(rule: StoredRule) {
    if (!window.confirm(`Remove the ${METRIC_LABELS[rule.metric]} rule (${scopeText(rule.scope)}) from today? Earlier versions keep it.`)) return;
    setFailure('');
    setBusy(true);
    try {
      await fetchJson(`/api/v1/jurisdictions/${ownerId}/profile/rules/${rule.ruleKey}`, { method: 'DELETE' });
      router.refresh();
    } catch (err) {
      setFailure(err instanceof Error ? err.message : 'The rule could not be removed.');
    } finally {
      setBusy(false);
    }
  }

  return (
    <div className="flex flex-col gap-3">
      {failure ? <Alert tone="error">{failure}</Alert> : null}
      {rules.length === 0 ? <p className="text-ink-soft">No rules yet: every metric falls back to the levels above.</p> : null}
      <ul className="flex flex-col gap-2" aria-label="Rules">
        {rules.map((rule) =>
          editing === rule.ruleKey ? (
            <li key={rule.ruleKey}>
              <RuleForm ownerId={ownerId} rule={rule} ruleKey={rule.ruleKey} today={today} onDone={() => setEditing(null)} />
            </li>
          ) : (
            <li key={rule.ruleKey} className="flex flex-col gap-1 rounded-lg border border-line bg-white p-3" data-testid="rule">
              <div className="flex flex-wrap items-baseline gap-x-2">
                <span className="font-semibold">{METRIC_LABELS[rule.metric]}</span>
                <span className="text-sm text-ink-soft">{scopeText(rule.scope)}</span>
              </div>
              <dl className="grid grid-cols-[auto_1fr] gap-x-3 text-sm">
                <dt className="text-ink-soft">Service</dt>
                <dd>{thresholdText(rule.metric, rule.comparator, rule.serviceAt)}</dd>
                <dt className="text-ink-soft">Danger</dt>
                <dd>{thresholdText(rule.metric, rule.comparator, rule.dangerAt)}</dd>
                <dt className="text-ink-soft">Source</dt>
                <dd>{rule.source}</dd>
                {rule.note ? (
                  <>
                    <dt className="text-ink-soft">Note</dt>
                    <dd>{rule.note}</dd>
                  </>
                ) : null}
              </dl>
              <div className="flex flex-wrap gap-2 pt-1">
                <Button type="button" variant="secondary" onClick={() => setEditing(rule.ruleKey)} aria-label={`Change ${METRIC_LABELS[rule.metric]} rule, ${scopeText(rule.scope)}`}>
                  Change
                </Button>
                <Button type="button" variant="ghost" disabled={busy} onClick={() => remove(rule)} aria-label={`Remove ${METRIC_LABELS[rule.metric]} rule, ${scopeText(rule.scope)}`}>
                  Remove
                </Button>
              </div>
            </li>
          ),
        )}
      </ul>
      {editing === 'new' ? (
        <RuleForm ownerId={ownerId} rule={null} ruleKey={null} today={today} onDone={() => setEditing(null)} />
      ) : (
        <div>
          <Button type="button" onClick={() => setEditing('new')}>Add a rule</Button>
        </div>
      )}
    </div>
  );
}
