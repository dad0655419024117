'use client';
// Hooks over the field app's state: the whole app (useField) and one visit with its verdicts (useVisit).
import { useContext, useMemo } from 'react';
import { newId } from '@/lib/ids';
import {
  emptyVisitRecord,
  localDate,
  submitBlockers,
  visitVerdicts,
  type FieldAppliance,
  type InspectionState,
  type LimitContext,
  type VisitRecord,
} from '@/lib/field';
import { defaultInspection } from '@/lib/field/record';
import type { Mutation, MutationKind, MutationOf } from '@/lib/validations/sync';
import type { ApplianceDetails } from '@/lib/validations/inspection';
import { APPLIANCE_CATEGORY_LABELS } from '@/lib/limits';
import { FieldContext, type FieldContextValue } from './field-provider';

export function useField(): FieldContextValue {
  const value = useContext(FieldContext);
  if (!value) throw new Error('useField must be used inside FieldProvider');
  return value;
}

/** A new mutation with its own id, stamped with the phone's clock. */
export function makeMutation<K extends MutationKind>(kind: K, visitId: string, payload: MutationOf<K>['payload']): Mutation {
  return { id: newId(), visitId, at: new Date().toISOString(), kind, payload } as Mutation;
}

export type VisitAppliance = FieldAppliance & { added: boolean };

export function applianceLabel(details: ApplianceDetails): string {
  return `${APPLIANCE_CATEGORY_LABELS[details.category]}, ${details.location}`;
}

const EMPTY_LIMITS: LimitContext = { chain: [], orgDefault: null };

export function useVisit(visitId: string) {
  const field = useField();
  const visit = field.bundle?.visits.find((v) => v.id === visitId) ?? null;
  const record: VisitRecord = field.records[visitId] ?? emptyVisitRecord(visitId);
  const limits = (visit && field.bundle?.limitContexts[visit.site.jurisdictionId]) || EMPTY_LIMITS;
  const timeZone = field.bundle?.timeZone ?? 'UTC';
  const date = localDate(record.arrivedAt ?? new Date().toISOString(), timeZone);

  const appliances: VisitAppliance[] = useMemo(
    () => [
      ...(visit?.appliances ?? []).map((a) => ({ ...a, added: false })),
      ...record.addedAppliances.map((a) => ({ id: a.id, details: a.details, updatedAt: '', history: [], added: true })),
    ],
    [visit, record.addedAppliances],
  );

  const inspectionOf = (applianceId: string): InspectionState => {
    const existing = record.inspections[applianceId];
    if (existing) return existing;
    const a = appliances.find((x) => x.id === applianceId);
    return defaultInspection(a?.details ?? ({} as ApplianceDetails), a && !a.added ? a.updatedAt : null);
  };

  // Appliances not yet started are left out of the verdict shown while recording (the submit
  // checks list them instead); by the time the visit can be submitted every one has been started,
  // so this is the same set the server judges.
  const verdicts = useMemo(
    () =>
      visitVerdicts({
        appliances: appliances
          .filter((a) => record.inspections[a.id] !== undefined)
          .map((a) => {
            const i = record.inspections[a.id]!;
            return { applianceId: a.id, details: i.details, spillage: i.spillage, readings: i.readings, notTestedReason: i.notTestedReason };
          }),
        roomChecks: record.roomChecks,
        tightness: record.tightness,
        findings: record.findings,
        makeSafe: record.makeSafe,
        limits,
        date,
      }),
    [appliances, record, limits, date],
  );

  const blockers = useMemo(
    () =>
      submitBlockers({
        appliances: appliances.map((a) => {
          const i = record.inspections[a.id];
          return {
            applianceId: a.id,
            label: applianceLabel(i?.details ?? a.details),
            readings: i?.readings ?? [],
            notTestedReason: i?.notTestedReason ?? null,
            analyserId: i?.analyserId ?? null,
            analyserOverrideReason: i?.analyserOverrideReason ?? null,
          };
        }),
        analysers: field.bundle?.analysers ?? [],
        verdicts,
        hasSignoff: record.signoff !== null,
        date,
      }),
    [appliances, record, verdicts, field.bundle, date],
  );

  const closedStatus = visit && ['submitted', 'certified', 'no_access', 'cancelled'].includes(visit.status);
  const closed = record.submittedAt !== null || record.noAccess !== null || Boolean(closedStatus);
  const entries = field.outbox.filter((e) => e.visitId === visitId);

  return { field, visit, record, limits, date, appliances, inspectionOf, verdicts, blockers, closed, entries };
}

export type VisitContext = ReturnType<typeof useVisit>;

/** Saves a change to an appliance's inspection (everything but readings) as one inspection.save. */
export function saveInspection(ctx: VisitContext, applianceId: string, patch: Partial<InspectionState>, label: string): Promise<void> {
  const { readings: _readings, ...current } = { ...ctx.inspectionOf(applianceId), ...patch };
  void _readings;
  return ctx.field.commit(makeMutation('inspection.save', ctx.record.visitId, { applianceId, ...current }), label);
}
