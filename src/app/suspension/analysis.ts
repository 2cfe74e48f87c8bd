/**
 * From the state to what the views show: the bicycle read from its fields, the layout's
 * linkage, and the curves (suspensionCurves), computed once per change of the bicycle or
 * the layout, never per render.
 */
import { useMemo } from 'react';
import type { Linkage } from '../../core/linkage';
import { buildLayout, suspensionCurves, type Bicycle, type SuspensionResult } from '../../core/suspension';
import { readDraft, type DraftReading } from './fields';
import type { LayoutDraft } from './state';
import { useSuspension } from './store';

export interface Analysis {
  readonly reading: DraftReading;
  /** Null while the bicycle's fields hold a problem. */
  readonly bicycle: Bicycle | null;
  readonly linkage: Linkage | null;
  /** Null while the bicycle's fields hold a problem (the reason is in `emptyReason`). */
  readonly result: SuspensionResult | null;
  /** Why there are no curves, in words; null when there are. */
  readonly emptyReason: string | null;
}

export function analyse(reading: DraftReading, layout: LayoutDraft): Analysis {
  const bicycle = reading.bicycle;
  if (bicycle === null) {
    const n = reading.issueCount;
    return {
      reading,
      bicycle,
      linkage: null,
      result: null,
      emptyReason: `No curves: the bicycle panel has ${n} problem${n === 1 ? '' : 's'} (shown beside the field${n === 1 ? '' : 's'}). Correct ${n === 1 ? 'it' : 'them'} to see the curves.`,
    };
  }
  const linkage = buildLayout(layout.kind, layout.pivots, bicycle.rearAxleMm, layout.axleBody, layout.shock);
  const result = suspensionCurves(linkage, bicycle, layout.floatingBrakeBody === null ? {} : { floatingBrakeBody: layout.floatingBrakeBody });
  return { reading, bicycle, linkage, result, emptyReason: result.ok ? null : `No curves: ${result.reason}.` };
}

/** The analysis of the design in the store, recomputed only when the fields or the layout change. */
export function useAnalysis(): Analysis {
  const draft = useSuspension((s) => s.draft);
  const layout = useSuspension((s) => s.layout);
  const reading = useMemo(() => readDraft(draft), [draft]);
  return useMemo(() => analyse(reading, layout), [reading, layout]);
}
