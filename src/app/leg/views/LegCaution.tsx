/** The walking-leg caution, as every leg view shows it. */
import { GAIT_CAUTION } from '../../../core/gait';

export function LegCaution() {
  return (
    <p className="caution leg-caution" data-testid="leg-caution">
      <strong className="caution-label">Caution:</strong>
      {GAIT_CAUTION}
    </p>
  );
}
