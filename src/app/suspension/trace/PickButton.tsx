/** A small button beside a field or pivot: the next click on the calibrated image sets it. Shown only while there is such an image. */
import { memo } from 'react';
import { dispatchTrace, useTrace } from './traceStore';
import type { PickTarget } from './traceState';

const sameTarget = (a: PickTarget, b: PickTarget) => a.kind === b.kind && (a.kind !== 'pivot' || (b.kind === 'pivot' && a.name === b.name));

export const PickButton = memo(function PickButton({ target, what }: { target: PickTarget; what: string }) {
  const available = useTrace((s) => s.placement !== null && s.url !== null && !s.hidden);
  const active = useTrace((s) => s.mode.kind === 'pick' && sameTarget(s.mode.target, target));
  if (!available) return null;
  return (
    <button
      type="button"
      className="trace-pick"
      aria-pressed={active}
      aria-label={`Pick ${what} on the image`}
      title={active ? 'Click the point on the image under the side view (Esc cancels)' : `Set ${what} by clicking it on the traced image`}
      onClick={() => dispatchTrace(active ? { type: 'cancel' } : { type: 'pick', target })}
    >
      pick on image
    </button>
  );
});
