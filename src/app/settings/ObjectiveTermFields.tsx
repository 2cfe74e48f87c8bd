/** The size and transmission terms added to the measure: their weights and the transmission guideline. */
import { checkGuideline, checkTermWeight, formatValue } from '../state/fields';
import type { SearchSettings } from '../state/project';
import { useDispatch } from '../state/store';
import { NumberInput } from './NumberInput';

export function ObjectiveTermFields({ terms }: { terms: SearchSettings['terms'] }) {
  const dispatch = useDispatch();
  const guideline = terms.transmissionGuidelineDeg;
  return (
    <fieldset>
      <legend>Also weigh (0: not at all)</legend>
      <p className="panel-note">
        A weight of 1 makes a figure of 1 cost as much as missing every target point by 5 % of the target's span.
      </p>
      <div className="field-row">
        Transmission weight{' '}
        <NumberInput
          value={terms.transmissionWeight}
          label="Transmission weight"
          issueKey="transmission-weight"
          check={(text) => checkTermWeight('Transmission weight', text)}
          format={formatValue}
          onCommit={(transmissionWeight) => dispatch({ type: 'settings/terms', patch: { transmissionWeight } })}
        />{' '}
        for a worst transmission angle outside{' '}
        <NumberInput
          value={guideline}
          label="Transmission guideline (degrees)"
          issueKey="transmission-guideline"
          check={checkGuideline}
          format={formatValue}
          onCommit={(transmissionGuidelineDeg) => dispatch({ type: 'settings/terms', patch: { transmissionGuidelineDeg } })}
        />
        ° to {formatValue(180 - guideline)}° <span className="option-note">(figure: the shortfall as a share of the guideline; common practice: 40° to 140°)</span>
      </div>
      <div className="field-row">
        Size weight{' '}
        <NumberInput
          value={terms.sizeWeight}
          label="Size weight"
          issueKey="size-weight"
          check={(text) => checkTermWeight('Size weight', text)}
          format={formatValue}
          onCommit={(sizeWeight) => dispatch({ type: 'settings/terms', patch: { sizeWeight } })}
        />{' '}
        <span className="option-note">(figure: the motion's larger side beyond the target's span, in spans)</span>
      </div>
    </fieldset>
  );
}
