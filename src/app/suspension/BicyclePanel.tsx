/**
 * The bicycle panel: every measurement of the Bicycle, each with its unit, read as typed,
 * with validateBicycle's message beside the field it is about.
 */
import { memo, useId, type ReactNode } from 'react';
import { ATMOSPHERE_KPA, DEFAULT_CHAIN_PITCH_MM, GAS_LAW_EXPONENT, type GasLaw } from '../../core/suspension';
import type { DraftField, FieldIssues, FrontMode, SpringMode } from './fields';
import { useSuspension, useSuspensionDispatch } from './store';
import { PickButton } from './trace';

function Field({ field, label, unit, issues, hint, wide }: { field: DraftField; label: string; unit: string; issues: FieldIssues; hint?: string; wide?: boolean }) {
  const id = useId();
  const value = useSuspension((s) => s.draft[field]);
  const dispatch = useSuspensionDispatch();
  const messages = issues[field] ?? [];
  const bad = messages.length > 0;
  return (
    <div className={`susp-field${wide === true ? ' susp-field-wide' : ''}`} data-field={field}>
      <label htmlFor={id}>{label}</label>
      <span className="susp-input-unit">
        <input
          id={id}
          type="text"
          inputMode="decimal"
          spellCheck={false}
          value={value}
          aria-invalid={bad}
          aria-describedby={bad ? `${id}-issue` : undefined}
          onChange={(e) => dispatch({ type: 'field', field, text: e.target.value })}
        />
        <span className="susp-unit">{unit}</span>
      </span>
      {hint !== undefined && <span className="susp-hint">{hint}</span>}
      {bad && (
        <span className="susp-issue" id={`${id}-issue`} role="alert" data-testid={`issue-${field}`}>
          {messages.join('; ')}
        </span>
      )}
    </div>
  );
}

function Group({ title, children }: { title: string; children: ReactNode }) {
  return (
    <fieldset className="susp-group">
      <legend>{title}</legend>
      {children}
    </fieldset>
  );
}

const GAS_LAW_TEXT: Readonly<Record<GasLaw, string>> = {
  isothermal: `isothermal, p·V constant (n = ${GAS_LAW_EXPONENT.isothermal}): slow compression`,
  adiabatic: `adiabatic, p·V^γ constant (γ = ${GAS_LAW_EXPONENT.adiabatic}): fast compression`,
};

export const BicyclePanel = memo(function BicyclePanel({ issues }: { issues: FieldIssues }) {
  const dispatch = useSuspensionDispatch();
  const frontMode = useSuspension((s) => s.draft.frontMode);
  const springMode = useSuspension((s) => s.draft.springMode);
  const gasLaw = useSuspension((s) => s.draft.gasLaw);
  return (
    <section className="panel susp-panel" aria-labelledby="susp-bicycle-title" data-testid="bicycle-panel">
      <h2 id="susp-bicycle-title">Bicycle</h2>
      <p className="susp-note">Origin at the bottom-bracket centre, x forward, y up; mm. Rear axle and shock at full extension.</p>
      <Group title="Wheels and frame">
        <Field field="rearAxleX" label="Rear axle x" unit="mm" issues={issues} />
        <Field field="rearAxleY" label="Rear axle y" unit="mm" issues={issues} />
        <PickButton target={{ kind: 'rearAxle' }} what="the rear axle" />
        <Field field="wheelRadius" label="Wheel radius (tyre included)" unit="mm" issues={issues} wide />
        <div className="susp-field susp-field-wide">
          <span className="susp-radio-title">Front wheel given by</span>
          <span className="susp-radios">
            {(['wheelbase', 'frontContact'] as const satisfies readonly FrontMode[]).map((mode) => (
              <label key={mode}>
                <input type="radio" name="susp-front-mode" checked={frontMode === mode} onChange={() => dispatch({ type: 'frontMode', mode })} />
                {mode === 'wheelbase' ? 'wheelbase' : 'front contact x'}
              </label>
            ))}
          </span>
        </div>
        <Field
          field="front"
          label={frontMode === 'wheelbase' ? 'Wheelbase' : 'Front contact x'}
          unit="mm"
          issues={issues}
          hint={frontMode === 'wheelbase' ? 'rear axle to front contact point, horizontally' : 'x of the front tyre’s contact point'}
          wide
        />
        <PickButton target={{ kind: 'frontContact' }} what="the front contact point" />
        <Field field="comHeight" label="Centre-of-mass height (rider and bicycle, above ground)" unit="mm" issues={issues} wide />
      </Group>
      <Group title="Drivetrain">
        <Field field="chainringTeeth" label="Chainring" unit="teeth" issues={issues} />
        <Field field="chainPitch" label="Chain pitch" unit="mm" issues={issues} hint={`empty: ${DEFAULT_CHAIN_PITCH_MM} mm (½ inch)`} />
        <Field field="cogTeeth" label="Cogs (teeth, smallest first or any order)" unit="teeth" issues={issues} wide />
      </Group>
      <Group title="Shock">
        <Field field="eyeToEye" label="Eye-to-eye" unit="mm" issues={issues} />
        <Field field="stroke" label="Stroke" unit="mm" issues={issues} />
        <Field field="sagPct" label="Sag" unit="% of travel" issues={issues} />
      </Group>
      <Group title="Spring (optional: for the wheel rate)">
        <div className="susp-field susp-field-wide">
          <span className="susp-radios">
            {(['none', 'coil', 'air'] as const satisfies readonly SpringMode[]).map((mode) => (
              <label key={mode}>
                <input type="radio" name="susp-spring-mode" checked={springMode === mode} onChange={() => dispatch({ type: 'springMode', mode })} />
                {mode === 'none' ? 'none' : mode === 'coil' ? 'coil' : 'air'}
              </label>
            ))}
          </span>
        </div>
        {springMode === 'coil' && (
          <>
            <Field field="coilRate" label="Spring rate" unit="N/mm" issues={issues} />
            <Field field="coilPreload" label="Preload" unit="mm" issues={issues} hint="empty: none" />
          </>
        )}
        {springMode === 'air' && (
          <>
            <Field field="airPressure" label="Pressure (gauge)" unit="kPa" issues={issues} hint={`above ${ATMOSPHERE_KPA} kPa atmospheric`} />
            <Field field="airVolume" label="Chamber volume" unit="mm³" issues={issues} hint="at full extension" />
            <Field field="airPistonArea" label="Piston area" unit="mm²" issues={issues} />
            <div className="susp-field susp-field-wide">
              <span className="susp-radio-title">Gas law (positive chamber only; no negative chamber or friction)</span>
              <span className="susp-radios susp-radios-column">
                {(['isothermal', 'adiabatic'] as const).map((law) => (
                  <label key={law}>
                    <input type="radio" name="susp-gas-law" checked={gasLaw === law} onChange={() => dispatch({ type: 'gasLaw', law })} />
                    {GAS_LAW_TEXT[law]}
                  </label>
                ))}
              </span>
            </div>
          </>
        )}
      </Group>
    </section>
  );
});
